// Layout checks by geometry: what a person would see as broken, measured from bounding boxes.
import type { Locator, Page } from '@playwright/test';

export interface LayoutProblem {
	kind: 'sideways-scroll' | 'off-screen' | 'overlap' | 'clipped' | 'small-target';
	what: string;
}

/**
 * Everything on the page that a person could see as broken: the page scrolls sideways, an
 * element reaches past the viewport's sides, two pieces of text are drawn over each other,
 * text is cut off by a box that hides its overflow (an ellipsis at the end of one line is
 * deliberate and allowed), or a control is smaller than 44 × 44 CSS px (WCAG 2.2 SC 2.5.5
 * "Target Size (Enhanced)"; links inside a sentence are exempt there too).
 */
export async function layoutProblems(page: Page, root: Locator | null = null) {
	const handle = root ? await root.elementHandle() : null;
	return page.evaluate((scope: HTMLElement | SVGElement | null): LayoutProblem[] => {
		const out: LayoutProblem[] = [];
		const vw = document.documentElement.clientWidth;
		const base = scope ?? document.body;
		const name = (el: Element) => {
			const t = (el.textContent ?? '').trim().replace(/\s+/g, ' ').slice(0, 40);
			const id = el.getAttribute('data-testid');
			return `<${el.tagName.toLowerCase()}${id ? ` ${id}` : ''}> “${t}”`;
		};
		// not rendered: display none, hidden, transparent, or inside a closed <details>
		const shown = (el: Element) =>
			el.checkVisibility({
				opacityProperty: true,
				visibilityProperty: true,
				contentVisibilityAuto: true
			});
		const srOnly = (r: DOMRect) => r.width <= 1 && r.height <= 1;

		if (!scope && document.documentElement.scrollWidth > vw + 1) {
			out.push({
				kind: 'sideways-scroll',
				what: `page is ${document.documentElement.scrollWidth} px wide in a ${vw} px viewport`
			});
		}

		// inner boxes that scroll sideways (each said once), elements past the viewport's sides
		const scrollers: Element[] = [];
		for (const el of base.querySelectorAll('*')) {
			if (scrollers.some((x) => x.contains(el))) continue;
			const r = el.getBoundingClientRect();
			if (!shown(el) || srOnly(r) || r.width === 0) continue;
			const s = getComputedStyle(el);
			if (
				(s.overflowX === 'auto' || s.overflowX === 'scroll') &&
				el.scrollWidth > el.clientWidth + 1
			) {
				out.push({ kind: 'sideways-scroll', what: `${name(el)} scrolls sideways` });
				scrollers.push(el);
			}
			if (r.left < -1 || r.right > vw + 1) {
				out.push({ kind: 'off-screen', what: `${name(el)} spans ${r.left}–${r.right} px` });
			}
		}

		// text: visible rectangles after every clipping ancestor
		type Piece = { node: Text; rect: DOMRect; owner: Element };
		const pieces: Piece[] = [];
		const cutters = new Set<Element>();
		const walker = document.createTreeWalker(base, NodeFilter.SHOW_TEXT);
		for (let n = walker.nextNode() as Text | null; n; n = walker.nextNode() as Text | null) {
			if (!n.data.trim()) continue;
			const owner = n.parentElement;
			if (!owner || owner.closest('script,style,option,select,svg,title') || !shown(owner))
				continue;
			const range = document.createRange();
			range.selectNodeContents(n);
			for (const rect of range.getClientRects()) {
				if (rect.width < 1 || rect.height < 1) continue;
				let clipOk = true;
				for (
					let a: Element | null = owner;
					a && a !== document.documentElement;
					a = a.parentElement
				) {
					const s = getComputedStyle(a);
					if (s.position === 'fixed') break;
					const hidesX = s.overflowX !== 'visible';
					const hidesY = s.overflowY !== 'visible';
					if (!hidesX && !hidesY) continue;
					const c = a.getBoundingClientRect();
					if (srOnly(c)) {
						clipOk = false; // screen-reader-only text: not on screen by design
						break;
					}
					const cutY = hidesY && (rect.top < c.top - 1 || rect.bottom > c.bottom + 1);
					const cutX = hidesX && (rect.left < c.left - 1 || rect.right > c.right + 1);
					const ellipsis = s.textOverflow === 'ellipsis' && s.whiteSpace === 'nowrap';
					// scrolled-away rows of a list that scrolls vertically are reachable, not clipped
					const scrolls = s.overflowY === 'auto' || s.overflowY === 'scroll';
					if (((cutY && !scrolls) || (cutX && !ellipsis)) && !cutters.has(a)) {
						cutters.add(a); // said once per box
						out.push({ kind: 'clipped', what: `${name(owner)} is cut off by ${name(a)}` });
					}
					if (cutY || cutX) clipOk = false;
					break;
				}
				if (clipOk) pieces.push({ node: n, rect, owner });
			}
		}
		for (let i = 0; i < pieces.length; i++) {
			for (let j = i + 1; j < pieces.length; j++) {
				const a = pieces[i];
				const b = pieces[j];
				if (a.node === b.node) continue;
				const w = Math.min(a.rect.right, b.rect.right) - Math.max(a.rect.left, b.rect.left);
				const h = Math.min(a.rect.bottom, b.rect.bottom) - Math.max(a.rect.top, b.rect.top);
				// a pixel of shared edge is how lines of text meet; more is text over text
				if (w > 1 && h > 1) {
					out.push({
						kind: 'overlap',
						what: `“${a.node.data.trim().slice(0, 30)}” over “${b.node.data.trim().slice(0, 30)}”`
					});
				}
			}
		}

		for (const el of base.querySelectorAll(
			'a[href], button, input:not([type=hidden]), select, textarea, [role=button], [role=option]'
		)) {
			const r = el.getBoundingClientRect();
			if (!shown(el) || srOnly(r) || r.width === 0) continue;
			if (el.tagName === 'A' && getComputedStyle(el).display === 'inline') continue;
			// a box or radio counts with its label when the label is the target
			const label = el.closest('label');
			const box = label ? label.getBoundingClientRect() : r;
			if (box.width < 44 - 0.5 || box.height < 44 - 0.5) {
				out.push({
					kind: 'small-target',
					what: `${name(el)} is ${Math.round(box.width)} × ${Math.round(box.height)} px`
				});
			}
		}
		return out;
	}, handle);
}
