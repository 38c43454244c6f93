/**
 * Pure helpers over a lesson's raw mdsvex source: front matter, components and plain text.
 * Imports nothing (used by the build-time content check run outside Vite, and by the
 * search index).
 */

export interface SplitSource {
	/** The YAML between the opening and closing `---` lines, or null when there is none. */
	frontMatter: string | null;
	body: string;
	/** 1-based line number where the body starts, for messages. */
	bodyLine: number;
}

const FRONT_MATTER = /^---\r?\n([\s\S]*?)\r?\n---[ \t]*(?:\r?\n|$)/;

export function splitFrontMatter(raw: string): SplitSource {
	const match = FRONT_MATTER.exec(raw);
	if (!match) return { frontMatter: null, body: raw, bodyLine: 1 };
	return { frontMatter: match[1], body: raw.slice(match[0].length), bodyLine: match[0].split('\n').length };
}

export interface ComponentTag {
	name: string;
	/** The tag's source from `<` to `>`, attributes included. */
	source: string;
	start: number;
	end: number;
	selfClosing: boolean;
}

/**
 * Finds Svelte component tags (capitalised names) in a body. Attribute values may hold `>`
 * inside quotes or `{...}` expressions, so the scan tracks both rather than using a regex.
 */
export function findComponentTags(body: string): ComponentTag[] {
	const tags: ComponentTag[] = [];
	const opening = /<([A-Z][A-Za-z0-9]*)/g;
	let match: RegExpExecArray | null;
	while ((match = opening.exec(body))) {
		const start = match.index;
		let i = start + match[0].length;
		let depth = 0;
		let quote: string | null = null;
		for (; i < body.length; i++) {
			const ch = body[i];
			if (quote) {
				if (ch === '\\') i++;
				else if (ch === quote) quote = null;
			} else if (ch === '"' || ch === "'" || (ch === '`' && depth > 0)) quote = ch;
			else if (ch === '{') depth++;
			else if (ch === '}') depth--;
			else if (ch === '>' && depth === 0) break;
		}
		const end = Math.min(i + 1, body.length);
		const source = body.slice(start, end);
		tags.push({ name: match[1], source, start, end, selfClosing: /\/\s*>$/.test(source) });
		opening.lastIndex = end;
	}
	return tags;
}

/** The value of a plain string attribute (`name="value"`), or undefined. */
export function stringAttribute(tag: ComponentTag, name: string): string | undefined {
	const match = new RegExp(`\\s${name}\\s*=\\s*(?:"([^"]*)"|'([^']*)')`).exec(tag.source);
	return match ? (match[1] ?? match[2]) : undefined;
}

const SCRIPT_OR_STYLE = /<(script|style)\b[^>]*>[\s\S]*?<\/\1>/g;
const DISPLAY_MATH = /\$\$[\s\S]*?\$\$/g;
const INLINE_MATH = /\$[^$\n]+\$/g;

/** The body with script and style blocks, math and component tags taken out (text between tags kept). */
export function stripMarkup(body: string): string {
	let text = body.replace(SCRIPT_OR_STYLE, ' ').replace(DISPLAY_MATH, ' ').replace(INLINE_MATH, ' ');
	const tags = findComponentTags(text);
	for (const tag of tags.reverse()) text = text.slice(0, tag.start) + ' ' + text.slice(tag.end);
	return text.replace(/<\/[A-Za-z][A-Za-z0-9]*\s*>/g, ' ').replace(/<[a-z][^>]*>/g, ' ');
}

/** `## Heading` texts of a body, in order. */
export function headings(body: string): string[] {
	return [...stripMarkup(body).matchAll(/^#{2,6}\s+(.+?)\s*#*\s*$/gm)].map((m) => inlineText(m[1]));
}

function inlineText(markdown: string): string {
	return markdown
		.replace(/!\[([^\]]*)\]\([^)]*\)/g, '$1')
		.replace(/\[([^\]]*)\]\([^)]*\)/g, '$1')
		.replace(/`([^`]*)`/g, '$1')
		.replace(/(\*\*|__|\*|_)(\S(?:.*?\S)?)\1/g, '$2')
		.replace(/&[a-z]+;/g, ' ');
}

/** Readable plain text of a lesson source: no front matter, code, components, math or Markdown marks. */
export function plainText(raw: string): string {
	const lines = stripMarkup(splitFrontMatter(raw).body)
		.split('\n')
		.map((line) =>
			inlineText(
				line
					.replace(/^\s{0,3}#{1,6}\s+/, '')
					.replace(/^\s*(?:[-*+]|\d+\.)\s+/, '')
					.replace(/^\s*>\s?/, '')
					.replace(/^\s*\|?(?:\s*:?-{3,}:?\s*\|)+\s*:?-*:?\s*$/, '')
					.replace(/\|/g, ' ')
			)
		);
	return lines.join(' ').replace(/\s+/g, ' ').trim();
}
