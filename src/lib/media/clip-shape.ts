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

/** True for an upright clip (taller than wide). */
export function isPortrait(width: number | null | undefined, height: number | null | undefined) {
	return !!width && !!height && height > width;
}

/** Sets the element's aspect ratio from the video's own size once its metadata has loaded. */
export function fitToClip(video: HTMLVideoElement) {
	const fit = () => {
		if (video.videoWidth > 0 && video.videoHeight > 0) {
			video.style.aspectRatio = clipAspect(video.videoWidth, video.videoHeight);
		}
	};
	video.addEventListener('loadedmetadata', fit);
	fit();
	return { destroy: () => video.removeEventListener('loadedmetadata', fit) };
}
