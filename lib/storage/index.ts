export {
  checkStorage,
  deleteObject,
  ensureBucket,
  getObjectBuffer,
  getObjectStream,
  headObject,
  presignGet,
  presignPut,
  putObject,
  type ObjectInfo,
  type PresignPutOptions,
} from "./s3";
export { captureObjectKey, photoObjectKey } from "./object-keys";
export { StorageError, type StorageErrorKind } from "./errors";
