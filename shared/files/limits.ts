import { z } from 'zod';

/**
 * What may be uploaded. The browser checks these before it starts (to save a phone's data), the API
 * checks the declared values when it signs an upload, and checks the stored object again with
 * HeadObject when the upload is confirmed — storage itself enforces neither size nor type.
 */

export const PHOTO_TYPES = ['image/jpeg', 'image/png', 'image/webp'] as const;
export const DOCUMENT_TYPES = ['application/pdf'] as const;
export type PhotoType = (typeof PHOTO_TYPES)[number];
export type DocumentType = (typeof DOCUMENT_TYPES)[number];

export const MB = 1024 * 1024;
export const PHOTO_MAX_BYTES = 15 * MB;
export const DOCUMENT_MAX_BYTES = 25 * MB;
/**
 * The largest picture the server will decode (width × height). A PNG of a single colour compresses
 * about a thousandfold, so a file well under the byte limit can still unpack to gigabytes; the pixel
 * count is what bounds the memory a decode takes. 40 MP is above what phones save by default.
 */
export const PHOTO_MAX_PIXELS = 40_000_000;

export const PHOTO_TAGS = ['before', 'after', 'detail'] as const;
export type PhotoTag = (typeof PHOTO_TAGS)[number];
export const PHOTO_TAG_LABELS: Record<PhotoTag, string> = { before: 'Before', after: 'After', detail: 'Detail' };

/** File extension stored in the object key; keys are made by the server, never from a file name. */
export const EXTENSION_BY_TYPE: Record<PhotoType | DocumentType, string> = {
  'image/jpeg': 'jpg',
  'image/png': 'png',
  'image/webp': 'webp',
  'application/pdf': 'pdf',
};

export const attachmentCreateSchema = z.discriminatedUnion('kind', [
  z.object({
    kind: z.literal('photo'),
    tag: z.enum(PHOTO_TAGS, { message: 'Tag the photo: before, after or detail.' }),
    caption: z.string().trim().max(300).optional(),
    contentType: z.enum(PHOTO_TYPES, { message: 'Photos must be JPEG, PNG or WebP.' }),
    size: z.number().int().min(1, 'The file is empty.').max(PHOTO_MAX_BYTES, 'Photos may be at most 15 MB.'),
  }),
  z.object({
    kind: z.literal('document'),
    caption: z.string().trim().max(300).optional(),
    contentType: z.enum(DOCUMENT_TYPES, { message: 'Documents must be PDF files.' }),
    size: z.number().int().min(1, 'The file is empty.').max(DOCUMENT_MAX_BYTES, 'Documents may be at most 25 MB.'),
  }),
]);
export type AttachmentCreate = z.infer<typeof attachmentCreateSchema>;

export function limitFor(kind: 'photo' | 'document'): { types: readonly string[]; maxBytes: number } {
  return kind === 'photo' ? { types: PHOTO_TYPES, maxBytes: PHOTO_MAX_BYTES } : { types: DOCUMENT_TYPES, maxBytes: DOCUMENT_MAX_BYTES };
}

/** A check for the browser before uploading: null when fine, else a sentence for the person. */
export function precheckFile(kind: 'photo' | 'document', file: { type: string; size: number }): string | null {
  const { types, maxBytes } = limitFor(kind);
  if (!types.includes(file.type)) return kind === 'photo' ? 'Photos must be JPEG, PNG or WebP.' : 'Documents must be PDF files.';
  if (file.size <= 0) return 'The file is empty.';
  if (file.size > maxBytes) return `That file is ${(file.size / MB).toFixed(1)} MB; the limit is ${maxBytes / MB} MB.`;
  return null;
}
