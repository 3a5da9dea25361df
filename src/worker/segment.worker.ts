/**
 * A worker the workbench's worker starts to read one segment of a big text file at a time
 * (core read-segment.ts), from its own slice of the File, so that a file is read on several cores
 * (segment-pool.ts). It answers with the segment's table, its typed arrays transferred. Asked to
 * profile a number column's parts afterwards, it answers with the column's profile.
 */
/// <reference lib="webworker" />
import { crossingTable, tableBuffers } from '../core/columns.ts';
import { isLevelwiseError } from '../core/errors.ts';
import { segmentReaderFor, type SegmentRequest } from '../core/parallel-read.ts';
import { profileNumberParts, requestBuffers } from '../core/number-profiles.ts';
import { releaseBuffer, releaseChunk } from '../core/release-buffers.ts';
import type { FromSegmentWorker, ToSegmentWorker } from './segment-pool.ts';
import { warmUpUntilMessage } from './warm-up.ts';

const scope = self as unknown as DedicatedWorkerGlobalScope; // the DOM lib types `self` as Window
/** Progress is told every this many bytes. */
const PROGRESS_EVERY = 4 << 20;

scope.addEventListener('message', (event: MessageEvent<ToSegmentWorker>) => {
  const message = event.data;
  const { id } = message;
  if (message.type === 'profile') {
    try {
      // The parts are copies made for this request (segment-pool.ts transfers them): once joined, or answered, they can go.
      scope.postMessage({ type: 'profile', id, profile: profileNumberParts(message.request, true) } satisfies FromSegmentWorker);
    } catch (error) {
      scope.postMessage(failure(id, error));
      for (const buffer of requestBuffers(message.request)) releaseBuffer(buffer);
    }
    return;
  }
  readSegment(id, message.file, message.request).then(
    (message) => scope.postMessage(message, message.type === 'done' ? tableBuffers(message.result.table) : []),
    (error: unknown) => scope.postMessage(failure(id, error)),
  );
});

// Segment workers are started ahead of need (segment-pool.ts warmSegmentWorkers): the reader and
// the number profile run once now, so that a big file's segment does not run them cold.
warmUpUntilMessage(scope);

async function readSegment(id: number, file: Blob, request: SegmentRequest): Promise<FromSegmentWorker> {
  const { job } = request;
  const reader = segmentReaderFor(request, file.size);
  const stream = file.slice(job.firstByte).stream().getReader();
  let atEnd = false;
  let told = 0;
  let read = 0;
  try {
    for (;;) {
      const next = await stream.read();
      if (next.done) {
        atEnd = true;
        break;
      }
      read += next.value.length;
      if (read - told >= PROGRESS_EVERY) {
        scope.postMessage({ type: 'progress', bytes: read - told } satisfies FromSegmentWorker);
        told = read;
      }
      const goOn = reader.push(next.value);
      // The reader copies what it keeps: the chunk's memory can go now, not at the next collection.
      releaseChunk(next.value);
      if (!goOn) break;
    }
  } finally {
    void stream.cancel();
  }
  scope.postMessage({ type: 'progress', bytes: read - told } satisfies FromSegmentWorker);
  const result = reader.finish(atEnd);
  // Identifier-like columns cross as their bytes (the request's packValues), not a string per value.
  return { type: 'done', id, result: { ...result, table: crossingTable(result.table) } };
}

function failure(id: number, error: unknown): FromSegmentWorker {
  if (isLevelwiseError(error)) return { type: 'failed', id, code: error.code, message: error.message, hint: error.hint };
  return { type: 'failed', id, code: null, message: error instanceof Error ? error.message : String(error), hint: '' };
}
