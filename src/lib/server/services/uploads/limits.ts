/** Most files one request may carry, and most bytes one request may send. */
export const MAX_FILES_PER_UPLOAD = 500;
export const MAX_UPLOAD_REQUEST_BYTES = 256 * 1024 * 1024;
