import { applyAction, deserialize } from '$app/forms';

/**
 * Posts a form to its SvelteKit action with XMLHttpRequest, so the browser reports upload
 * progress (fetch does not). The action's answer is applied as `use:enhance` would.
 */
export function postFormWithProgress(
	form: HTMLFormElement,
	onProgress: (fraction: number | null) => void
): Promise<void> {
	return new Promise((resolve, reject) => {
		const xhr = new XMLHttpRequest();
		xhr.open('POST', form.action);
		xhr.setRequestHeader('accept', 'application/json');
		xhr.setRequestHeader('x-sveltekit-action', 'true');
		xhr.upload.onprogress = (event) =>
			onProgress(event.lengthComputable ? event.loaded / event.total : null);
		xhr.onload = async () => {
			try {
				await applyAction(deserialize(xhr.responseText));
				resolve();
			} catch (err) {
				reject(err);
			}
		};
		xhr.onerror = () =>
			reject(new Error('The upload was interrupted. Check the connection and try again.'));
		xhr.send(new FormData(form));
	});
}
