import { escapeSvelte } from 'mdsvex';
import { codeToHtml } from 'shiki';
import remarkMath from 'remark-math';
import rehypeKatex from 'rehype-katex';

/**
 * KaTeX leaves the TeX source in its output (annotation elements), and Svelte reads
 * `{...}` there as an expression. Escaping braces in text nodes of KaTeX's output keeps
 * formulas intact.
 */
function rehypeEscapeKatexBraces() {
	const escape = (node, insideKatex) => {
		const isKatex =
			insideKatex ||
			(node.type === 'element' &&
				Array.isArray(node.properties?.className) &&
				node.properties.className.some((c) => String(c).startsWith('katex')));
		if (node.type === 'text' && insideKatex) {
			node.value = node.value.replace(/[{}]/g, (c) => (c === '{' ? '&#123;' : '&#125;'));
			node.type = 'raw';
		}
		for (const child of node.children ?? []) escape(child, isKatex);
	};
	return (tree) => escape(tree, false);
}

/** @type {import('mdsvex').MdsvexOptions} */
const config = {
	extensions: ['.md'],
	smartypants: { dashes: 'oldschool' },
	remarkPlugins: [remarkMath],
	rehypePlugins: [rehypeKatex, rehypeEscapeKatexBraces],
	highlight: {
		highlighter: async (code, lang = 'text') => {
			// The HTML goes into a template literal: a backslash in the code (a shell line
			// continuation) must stay a backslash, or the server and the browser read the
			// literal differently and hydration fails.
			const html = escapeSvelte(
				(await codeToHtml(code, { lang, theme: 'github-light' })).replace(/\\/g, '&#92;')
			);
			return `{@html \`${html}\` }`;
		}
	}
};

export default config;
