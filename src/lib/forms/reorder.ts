/** A copy of `list` with the item at `from` moved by `delta` places; unchanged at either end. */
export function moveBy<T>(list: readonly T[], from: number, delta: number): T[] {
	const to = from + delta;
	const copy = [...list];
	if (from < 0 || from >= list.length || to < 0 || to >= list.length) return copy;
	const [item] = copy.splice(from, 1);
	copy.splice(to, 0, item);
	return copy;
}
