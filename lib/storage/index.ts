export {
  checkStorage,
  closeStorage,
  deleteObject,
  ensureBucket,
  getObjectBuffer,
  getObjectStream,
  headObject,
  listObjectKeys,
  presignGet,
  presignPut,
  putObject,
  type ObjectInfo,
  type PresignPutOptions,
} from "./s3";
export { captureObjectKey, photoObjectKey } from "./object-keys";
export { StorageError, type StorageErrorKind } from "./errors";
