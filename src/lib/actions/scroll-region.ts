import type { Action } from 'svelte/action';

/**
 * Makes a box that scrolls a stop for the keyboard and a named region (WCAG 2.1.1: arrow
 * keys scroll it once it has the focus), only while its content is wider or taller than
 * the box, so boxes that fit add no tab stop. The name is the one given, else the table's
 * caption, else the heading of the section it sits in.
 */
export const scrollRegion: Action<HTMLElement, string | undefined> = (node, label) => {
	let given = label;
	const name = () =>
		given ?? node.querySelector('caption')?.textContent?.trim() ?? node.closest('section')?.querySelector('h2, h3')?.textContent?.trim() ?? 'Scrolling content';
	const check = () => {
		const scrolls = node.scrollWidth > node.clientWidth + 1 || node.scrollHeight > node.clientHeight + 1;
		if (scrolls) {
			node.tabIndex = 0;
			node.setAttribute('role', 'region');
			node.setAttribute('aria-label', name());
		} else if (node.hasAttribute('role')) {
			node.removeAttribute('tabindex');
			node.removeAttribute('role');
			node.removeAttribute('aria-label');
		}
	};
	// The box changes with the window, its content with the data: watch both.
	const watch = new ResizeObserver(check);
	watch.observe(node);
	for (const child of node.children) watch.observe(child);
	check();
	return {
		update(next) {
			given = next;
			check();
		},
		destroy: () => watch.disconnect()
	};
};
