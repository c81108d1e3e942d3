/**
 * A player sized to its clip's own shape (portrait, square or landscape), so a phone's upright
 * recording is not squeezed into a 16:9 box. Known dimensions give the shape before the clip
 * loads (no jump); the `fitToClip` action corrects it from the video's own size once known.
 */

/** 16:9 until the clip says otherwise. */
export const DEFAULT_ASPECT = '16 / 9';

/** The CSS aspect ratio of a clip `width` × `height`, or 16:9 when either is unknown. */
export function clipAspect(width: number | null | undefined, height: number | null | undefined) {
	return width && height && width > 0 && height > 0 ? `${width} / ${height}` : DEFAULT_ASPECT;
}

/**
 * The style of a player box in the clip's shape that is never taller than `maxHeight`: an upright
 * clip gets a narrower box (centred with `mx-auto`) rather than a wide box with bars beside it.
 */
export function clipBox(
	width: number | null | undefined,
	height: number | null | undefined,
	maxHeight = '70svh'
): string {
	const known = !!width && !!height && width > 0 && height > 0;
	const ratio = known ? width / height : 16 / 9;
	return `aspect-ratio: ${clipAspect(width, height)}; max-width: min(100%, calc(${maxHeight} * ${Math.round(ratio * 10000) / 10000}))`;
}

/** True for an upright clip (taller than wide). */
export function isPortrait(width: number | null | undefined, height: number | null | undefined) {
	return !!width && !!height && height > width;
}

/**
 * Sets the element's aspect ratio from the video's own size once its metadata has loaded (and,
 * for a box drawn by `clipBox`, its greatest width, from `data-max-height`).
 */
export function fitToClip(video: HTMLVideoElement) {
	const fit = () => {
		if (video.videoWidth > 0 && video.videoHeight > 0) {
			const maxHeight = video.dataset.maxHeight;
			if (maxHeight) video.style.cssText = clipBox(video.videoWidth, video.videoHeight, maxHeight);
			else video.style.aspectRatio = clipAspect(video.videoWidth, video.videoHeight);
		}
	};
	video.addEventListener('loadedmetadata', fit);
	fit();
	return { destroy: () => video.removeEventListener('loadedmetadata', fit) };
}
