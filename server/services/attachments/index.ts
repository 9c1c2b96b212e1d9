export { checkUpload, withStoredFile, insertAttachment, sniffType, type UploadedFile } from './store';
export { getAttachment, readAttachment, contentDisposition } from './download';
