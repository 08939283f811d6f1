/** One refused row as the import API lists it. */
export type UploadRowError = { row: number; column: string | null; message: string };

/** One file of the upload page: its progress, then the import API's answer. */
export type UploadItem = {
	/** Job key the server reports progress under (`x-import-job`). */
	key: string;
	file: File;
	state: 'waiting' | 'uploading' | 'done' | 'failed';
	uploadedBytes: number;
	serverRows: number;
	serverBytes: number;
	status?: 'imported' | 'duplicate' | 'rejected';
	id?: number;
	boards?: number;
	pads?: number;
	rejectedRows?: number;
	duplicateBoards?: number;
	errorCount?: number;
	errors?: UploadRowError[];
	message?: string;
};

function jobKey(): string {
	const bytes = crypto.getRandomValues(new Uint8Array(12));
	return Array.from(bytes, (b) => b.toString(16).padStart(2, '0')).join('');
}

/** A file waiting to be sent, with a warning when the server will refuse its size. */
export function waitingItem(file: File, maxUploadBytes: number): UploadItem {
	return {
		key: jobKey(),
		file,
		state: 'waiting',
		uploadedBytes: 0,
		serverRows: 0,
		serverBytes: 0,
		message:
			file.size > maxUploadBytes
				? `Larger than the ${Math.round(maxUploadBytes / 1024 / 1024)} MB upload limit; the server will refuse it.`
				: undefined
	};
}

/** Asks how far the server has read the file until `stop.done`. */
async function poll(item: UploadItem, stop: { done: boolean }) {
	while (!stop.done) {
		await new Promise((r) => setTimeout(r, 400));
		if (stop.done) return;
		try {
			const res = await fetch(`/api/spi/imports/progress/${item.key}`);
			if (res.ok) {
				const p = await res.json();
				item.serverRows = p.rows;
				item.serverBytes = p.bytes;
			}
		} catch {
			// Progress is a nicety; the upload's own answer is what counts.
		}
	}
}

/**
 * Sends one file to `POST /api/spi/imports` (XMLHttpRequest for its upload progress) and writes
 * progress and the answer into `item`, which the page shows as it changes. Never rejects.
 * @param profile a mapping profile id, or '' for the canonical layout
 */
export function uploadItem(item: UploadItem, profile: string): Promise<void> {
	return new Promise((resolve) => {
		const xhr = new XMLHttpRequest();
		const form = new FormData();
		// The profile must come before the file: the server reads the file as it streams in.
		form.append('profile', profile);
		form.append('file', item.file, item.file.name);
		xhr.open('POST', '/api/spi/imports');
		xhr.setRequestHeader('x-import-job', item.key);
		xhr.setRequestHeader('x-import-source', 'upload');
		xhr.setRequestHeader('accept', 'application/json');
		const stop = { done: false };
		xhr.upload.onprogress = (e) => {
			item.uploadedBytes = e.loaded;
		};
		xhr.onload = () => {
			stop.done = true;
			let body: Record<string, unknown> = {};
			try {
				body = JSON.parse(xhr.responseText);
			} catch {
				body = { error: `The server answered ${xhr.status} without a readable message.` };
			}
			item.uploadedBytes = item.file.size;
			if (xhr.status === 201 || xhr.status === 200 || xhr.status === 422) {
				item.state = 'done';
				Object.assign(item, body);
				if (xhr.status === 201)
					item.serverRows = Number(body.pads ?? 0) + Number(body.rejectedRows ?? 0);
			} else {
				item.state = 'failed';
				item.message = String(body.error ?? `The server answered ${xhr.status}.`);
			}
			resolve();
		};
		xhr.onerror = () => {
			stop.done = true;
			item.state = 'failed';
			item.message = 'The connection broke off; nothing of this file was imported. Try again.';
			resolve();
		};
		item.state = 'uploading';
		xhr.send(form);
		void poll(item, stop);
	});
}
