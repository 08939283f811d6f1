import { json } from '@sveltejs/kit';
import { ApiError, apiRoute } from '$lib/server/api';
import { actorLabel } from '$lib/server/audit';
import { getDb } from '$lib/server/db';
import { maxUploadBytes } from '$lib/server/env-defaults';
import {
	checkDeclaredSize,
	ingestSpiFile,
	isJobKey,
	limitBytes,
	listImports,
	multipartFile,
	rawBody,
	readAhead,
	resolveImportProfile,
	type UploadedFile
} from '$lib/server/ingest';

const RAW_TYPES = ['text/', 'application/csv', 'application/octet-stream'];

export const GET = apiRoute(({ url }) => {
	const before = Number(url.searchParams.get('before'));
	const limit = Number(url.searchParams.get('limit'));
	return json({
		imports: listImports(getDb(), {
			before: Number.isSafeInteger(before) && before > 0 ? before : null,
			limit: Number.isSafeInteger(limit) && limit > 0 ? limit : 50,
			status: url.searchParams.get('status')
		})
	});
});

function headerFileName(request: Request, url: URL): string {
	const raw = url.searchParams.get('fileName') ?? request.headers.get('x-file-name') ?? '';
	try {
		return decodeURIComponent(raw).trim() || 'upload.csv';
	} catch {
		return raw.trim() || 'upload.csv';
	}
}

export const POST = apiRoute(async ({ request, url }, actor) => {
	const limit = maxUploadBytes();
	const declared = checkDeclaredSize(request, limit);
	const type = (request.headers.get('content-type') ?? '').toLowerCase();
	let file: UploadedFile;
	if (type.startsWith('multipart/form-data')) {
		file = await multipartFile(request);
	} else if (RAW_TYPES.some((t) => type.startsWith(t))) {
		file = { fileName: headerFileName(request, url), fields: {}, body: rawBody(request) };
	} else {
		throw new ApiError(415, {
			error: `Send the file as multipart/form-data (field "file", optional "profile") or as a text/csv body; got "${type || 'no content-type'}".`
		});
	}
	const db = getDb();
	const { profile, profileId } = resolveImportProfile(
		db,
		file.fields.profile ?? url.searchParams.get('profile')
	);
	const job = request.headers.get('x-import-job');
	const outcome = await ingestSpiFile(db, {
		source: request.headers.get('x-import-source') === 'upload' ? 'upload' : 'api',
		fileName: file.fileName,
		// Read ahead in ~1 MB batches: socket chunks are 64 KB at most (see readAhead).
		body: limitBytes(readAhead(file.body), limit),
		profile,
		profileId,
		createdBy: actorLabel(actor),
		userId: actor.kind === 'user' ? actor.id : null,
		totalBytes: declared,
		// A chunked body declares no size: parse it on the parser thread (kept warm) as a large
		// file would be, rather than guess it small and parse it on this thread.
		threaded: declared === null ? true : undefined,
		job: isJobKey(job) ? job : null
	});
	if (outcome.status === 'imported') {
		const { status, id, boards, pads, rejectedRows, duplicateBoards, warnings } = outcome;
		return json(
			{ id, status, boards, pads, rejectedRows, duplicateBoards, warnings },
			{ status: 201 }
		);
	}
	if (outcome.status === 'duplicate') return json({ id: outcome.id, status: 'duplicate' });
	return json(
		{
			id: outcome.id,
			status: 'rejected',
			errorCount: outcome.errorCount,
			errors: outcome.errors
		},
		{ status: 422 }
	);
});
