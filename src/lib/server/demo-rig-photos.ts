/**
 * Invented "photos" of a training rig for the demo, drawn as SVG and rendered to JPEG at seed
 * time (so they pass through the same upload pipeline as a phone's photo). No real place,
 * product or brand is shown.
 */
const frame = (w: number, h: number, body: string) =>
	`<svg xmlns="http://www.w3.org/2000/svg" width="${w}" height="${h}" viewBox="0 0 ${w} ${h}">${body}</svg>`;

const text = (x: number, y: number, s: string, size = 28, fill = '#171f27') =>
	`<text x="${x}" y="${y}" font-family="DejaVu Sans, Arial, sans-serif" font-size="${size}" fill="${fill}">${s}</text>`;

/** A clear pipe section on trestles with the wrapped packer inside it. */
export function rigBaySvg(label: string): string {
	return frame(
		1200,
		900,
		`<rect width="1200" height="900" fill="#d9d4c7"/>
		<rect y="640" width="1200" height="260" fill="#8b8478"/>
		<rect x="150" y="600" width="30" height="140" fill="#5d5346"/><rect x="1020" y="600" width="30" height="140" fill="#5d5346"/>
		<rect x="80" y="430" width="1040" height="180" rx="20" fill="#c9e4ea" stroke="#5a6e7e" stroke-width="8" opacity="0.9"/>
		<rect x="360" y="455" width="480" height="130" rx="60" fill="#3a3a3a"/>
		<rect x="400" y="460" width="400" height="120" rx="20" fill="#d7b26a" stroke="#8a4f0e" stroke-width="6"/>
		<path d="M400 490 H800 M400 520 H800 M400 550 H800" stroke="#b2690c" stroke-width="3"/>
		<line x1="840" y1="520" x2="1160" y2="380" stroke="#252f39" stroke-width="10"/>
		<circle cx="1160" cy="380" r="12" fill="#252f39"/>
		${text(60, 90, 'Training rig · bay 2', 44)}
		${text(60, 140, label, 32, '#364452')}
		${text(420, 680, 'DN150 test pipe, patch on packer', 26, '#fbf8f2')}`
	);
}

/** A pressure gauge with its needle at `bar` on a 0-4 bar dial. */
export function gaugeSvg(bar: number): string {
	const angle = -135 + (bar / 4) * 270;
	const ticks = Array.from({ length: 9 }, (_, i) => {
		const a = ((-135 + i * 33.75 - 90) * Math.PI) / 180;
		return `<line x1="${600 + Math.cos(a) * 250}" y1="${450 + Math.sin(a) * 250}" x2="${600 + Math.cos(a) * 290}" y2="${450 + Math.sin(a) * 290}" stroke="#171f27" stroke-width="${i % 2 ? 4 : 8}"/>` +
			(i % 2 ? '' : text(600 + Math.cos(a) * 215 - 12, 450 + Math.sin(a) * 215 + 12, String(i / 2), 34));
	}).join('');
	return frame(
		1200,
		900,
		`<rect width="1200" height="900" fill="#4b4f52"/>
		<circle cx="600" cy="450" r="330" fill="#e9e6df" stroke="#9aa3a8" stroke-width="24"/>
		${ticks}
		<line x1="600" y1="450" x2="600" y2="190" stroke="#b3141f" stroke-width="10" transform="rotate(${angle} 600 450)"/>
		<circle cx="600" cy="450" r="22" fill="#171f27"/>
		${text(560, 600, 'bar', 40)}
		${text(40, 870, `Held at ${bar.toFixed(1)} bar during the cure`, 36, '#fbf8f2')}`
	);
}

/** A glass mat on the wet-out bench, half wetted, with a roller. */
export function wetOutSvg(): string {
	return frame(
		1200,
		900,
		`<rect width="1200" height="900" fill="#c8c2b4"/>
		<rect x="100" y="250" width="1000" height="460" fill="#e4e1da" stroke="#7c766a" stroke-width="6"/>
		<rect x="180" y="320" width="840" height="320" fill="#f6f3ea" stroke="#bdb6a6" stroke-width="4"/>
		<rect x="180" y="320" width="520" height="320" fill="#d9a94f" opacity="0.85"/>
		<path d="M200 340 L680 620 M260 330 L700 590 M180 420 L560 640" stroke="#b2690c" stroke-width="3" opacity="0.6"/>
		<rect x="640" y="360" width="60" height="240" rx="20" fill="#6b7780"/>
		<line x1="700" y1="480" x2="900" y2="480" stroke="#364452" stroke-width="14"/>
		${text(60, 90, 'Wet-out bench', 44)}
		${text(60, 140, 'Resin worked in from both faces', 30, '#364452')}`
	);
}
