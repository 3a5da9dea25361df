/**
 * Saving what the page made. Small results become a Blob and a download link. A large encoded CSV
 * goes straight to disk through the File System Access API where the browser has it, part by part,
 * so it never has to fit in memory at once (see PERFORMANCE.md, "Writing large output").
 */

/** Above this estimated size the encoded CSV is streamed to a file the person picks. */
export const STREAM_ABOVE_BYTES = 256 * 1024 * 1024;

export function saveBlob(blob: Blob, fileName: string): void {
  const url = URL.createObjectURL(blob);
  const link = document.createElement('a');
  link.href = url;
  link.download = fileName;
  link.rel = 'noopener';
  link.style.display = 'none';
  document.body.append(link);
  link.click();
  link.remove();
  // The download has started from the URL by now; keep it a little for slow browsers.
  setTimeout(() => URL.revokeObjectURL(url), 60_000);
}

export function saveText(text: string, fileName: string, type: string): void {
  saveBlob(new Blob([text], { type: `${type};charset=utf-8` }), fileName);
}

/** Where the parts of an export go. */
export interface PartSink {
  /** 'disk' when streaming to a picked file, 'download' when collecting for a Blob. */
  readonly kind: 'disk' | 'download';
  write(part: Uint8Array | Blob): void;
  finish(): Promise<void>;
  abort(): Promise<void>;
}

/** The File System Access API's picker, which TypeScript's DOM library does not describe yet. */
interface SavePickerWindow {
  showSaveFilePicker?(options: {
    suggestedName: string;
    types: { description: string; accept: Record<string, string[]> }[];
  }): Promise<{ createWritable(): Promise<{ write(data: Uint8Array | Blob): Promise<void>; close(): Promise<void>; abort(): Promise<void> }> }>;
}

/**
 * A sink for an export of about `estimatedBytes`. Resolves null when the person closed the save
 * picker without choosing a file. Must be called from a click (the picker needs a user gesture).
 */
export async function openPartSink(
  fileName: string,
  { type, extension, description }: { readonly type: string; readonly extension: string; readonly description: string },
  estimatedBytes: number,
): Promise<PartSink | null> {
  const picker = (window as unknown as SavePickerWindow).showSaveFilePicker;
  if (estimatedBytes > STREAM_ABOVE_BYTES && picker) {
    try {
      const handle = await picker.call(window, { suggestedName: fileName, types: [{ description, accept: { [type]: [extension] } }] });
      const writable = await handle.createWritable();
      let pending = Promise.resolve();
      return {
        kind: 'disk',
        write: (part) => {
          pending = pending.then(() => writable.write(part));
        },
        finish: async () => {
          await pending;
          await writable.close();
        },
        abort: async () => {
          await pending.catch(() => undefined);
          await writable.abort();
        },
      };
    } catch (error) {
      if (error instanceof DOMException && error.name === 'AbortError') return null;
      // Picker refused (e.g. not allowed here): fall back to a download.
    }
  }
  // Parts are kept as Blobs (byte parts become one as they arrive): the bytes sit in the browser's
  // blob store, not in the page's heap, and the final Blob only joins parts (one Blob made from the
  // whole file's bytes at the end would copy them all in one long task).
  const parts: Blob[] = [];
  return {
    kind: 'download',
    write: (part) => parts.push(part instanceof Blob ? part : new Blob([part as Uint8Array<ArrayBuffer>])),
    finish: async () => saveBlob(new Blob(parts, { type }), fileName),
    abort: async () => {
      parts.length = 0;
    },
  };
}

/** "survey 2024.csv" → "survey 2024". */
export function baseName(fileName: string): string {
  return fileName.replace(/\.[A-Za-z0-9]{1,5}$/, '') || 'levelwise';
}
