import { apiError } from '../api';
import { UploadError } from './uploads';

/** Runs an upload step, turning its plain refusals into the API's JSON error shape. */
export async function answering(step: () => Promise<Response>): Promise<Response> {
	try {
		return await step();
	} catch (error) {
		if (error instanceof UploadError) return apiError(error.status, error.message);
		throw error;
	}
}

/** The request's JSON body, or null when it is not JSON. */
export async function jsonBody(request: Request): Promise<unknown> {
	try {
		return await request.json();
	} catch {
		return null;
	}
}
