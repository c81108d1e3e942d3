/**
 * What a person typed before the page's script started must survive the start (hydration).
 *
 * The server-rendered page is usable as plain HTML while its script loads, which on an older
 * phone on a slow connection can be seconds; hydration then sets every field to the value the
 * components hold — the server's — and what was typed is gone. Fields written with
 * `defaultValue`/`defaultChecked` or `bind:` keep it, but one `value={…}` anywhere loses it, so
 * this is done once for every form instead of trusted to each field.
 *
 * `rememberTypedFields()` runs in the root layout's script, which Svelte runs before it hydrates
 * any page markup; it notes every field whose value differs from the one the server rendered
 * (its default). The returned function runs from the root layout's effect, after the whole page
 * has hydrated: it puts each noted value back and sends the `input` and `change` events a person's
 * typing would have sent, so bound state and live checks catch up.
 */

type Field = HTMLInputElement | HTMLTextAreaElement | HTMLSelectElement;

interface Typed {
	field: Field;
	value?: string;
	checked?: boolean;
	selected?: boolean[];
}

const UNTYPED = new Set(['hidden', 'submit', 'button', 'reset', 'image', 'file']);

function typedIn(field: Field): Typed | null {
	if (field instanceof HTMLSelectElement) {
		const options = [...field.options];
		return options.some((o) => o.selected !== o.defaultSelected)
			? { field, selected: options.map((o) => o.selected) }
			: null;
	}
	if (field instanceof HTMLInputElement) {
		if (UNTYPED.has(field.type)) return null;
		if (field.type === 'checkbox' || field.type === 'radio') {
			return field.checked !== field.defaultChecked ? { field, checked: field.checked } : null;
		}
	}
	return field.value !== field.defaultValue ? { field, value: field.value } : null;
}

export function rememberTypedFields(root: ParentNode = document): () => void {
	const typed = [...root.querySelectorAll<Field>('input, textarea, select')]
		.map(typedIn)
		.filter((t): t is Typed => t !== null);
	return () => {
		for (const { field, value, checked, selected } of typed) {
			if (!field.isConnected) continue;
			let changed = false;
			if (selected && field instanceof HTMLSelectElement) {
				[...field.options].forEach((option, i) => {
					if (selected[i] !== undefined && option.selected !== selected[i]) {
						option.selected = selected[i];
						changed = true;
					}
				});
			} else if (checked !== undefined && field instanceof HTMLInputElement) {
				changed = field.checked !== checked;
				field.checked = checked;
			} else if (value !== undefined && field.value !== value) {
				field.value = value;
				changed = true;
			}
			if (!changed) continue;
			field.dispatchEvent(new Event('input', { bubbles: true }));
			field.dispatchEvent(new Event('change', { bubbles: true }));
		}
	};
}
