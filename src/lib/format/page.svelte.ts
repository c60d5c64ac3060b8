// The shop's format for the page being shown: read from the app layout's data
// (`shopStyle`), made once per locale and zone.
import { page } from '$app/state';
import { shopFormat, type ShopFormat, type ShopStyle } from './index';

let last: { key: string; fmt: ShopFormat } | null = null;

/** The signed-in shop's ShopFormat; the defaults (en-GB, UTC) outside the app's pages. */
export function currentFormat(): ShopFormat {
	const style = (page.data as { shopStyle?: Partial<ShopStyle> }).shopStyle ?? {};
	const key = `${style.locale}|${style.timeZone}`;
	if (last?.key !== key) last = { key, fmt: shopFormat(style) };
	return last.fmt;
}
