// Sends the upload with XMLHttpRequest, the one browser API that reports upload progress, and
// reads the server's NDJSON answer line by line as it arrives: progress while the server parses
// and stores, then the result.
import type { UploadAnswer, UploadLine, UploadProgress } from '$lib/wire/upload';
import { PROBLEM_TYPES, problemTypeUri } from '$lib/wire/problem';

export type ServerProgress = UploadProgress;
export type UploadOutcome = { httpStatus: number; body: UploadAnswer };

export interface UploadCallbacks {
	/** Bytes of the request body sent so far, and its total. */
	onSent(sent: number, total: number): void;
	onServer(progress: ServerProgress): void;
}

export function sendUpload(url: string, form: FormData, cb: UploadCallbacks): { done: Promise<UploadOutcome>; abort: () => void } {
	const xhr = new XMLHttpRequest();
	let seen = 0;
	let result: UploadOutcome | null = null;

	const readLines = () => {
		const text = xhr.responseText;
		let nl = text.indexOf('\n', seen);
		while (nl !== -1) {
			const line = text.slice(seen, nl).trim();
			seen = nl + 1;
			if (line) {
				const msg = JSON.parse(line) as UploadLine;
				if (msg.kind === 'progress') cb.onServer(msg.progress);
				else result = { httpStatus: msg.httpStatus, body: msg.answer };
			}
			nl = text.indexOf('\n', seen);
		}
	};

	const done = new Promise<UploadOutcome>((resolve, reject) => {
		xhr.upload.onprogress = (e) => cb.onSent(e.loaded, e.lengthComputable ? e.total : 0);
		xhr.onprogress = () => {
			if ((xhr.getResponseHeader('content-type') ?? '').includes('ndjson')) readLines();
		};
		xhr.onload = () => {
			const type = xhr.getResponseHeader('content-type') ?? '';
			try {
				if (type.includes('ndjson')) {
					readLines();
					if (result) return resolve(result);
					return reject(new Error('The server closed the connection before answering. Nothing was stored.'));
				}
				if (type.includes('json')) return resolve({ httpStatus: xhr.status, body: JSON.parse(xhr.responseText) as UploadAnswer });
				const detail = xhr.responseText.slice(0, 300) || `The server answered ${xhr.status}.`;
				resolve({ httpStatus: xhr.status, body: { type: problemTypeUri('server-error'), title: PROBLEM_TYPES['server-error'], status: xhr.status, detail, outcome: 'error', field: null } });
			} catch (e) {
				reject(e instanceof Error ? e : new Error(String(e)));
			}
		};
		xhr.onerror = () => reject(new Error('The connection failed during the upload. Nothing was stored; try again.'));
		xhr.onabort = () => reject(new Error('Upload cancelled. Nothing was stored.'));
	});

	xhr.open('POST', url);
	xhr.setRequestHeader('accept', 'application/x-ndjson, application/json');
	xhr.send(form);
	return { done, abort: () => xhr.abort() };
}
