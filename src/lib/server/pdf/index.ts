export { embedLora, loraBytes, type LoraWeight } from './fonts';
export { wrapText, drawWrapped } from './text';
