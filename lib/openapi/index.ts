export { buildOpenApiDocument, openApiDocument, type OpenApiDocument } from "./document";
export { ROLE_EXTENSION, TAGS, type Tag } from "./operation";
