import { openApiDocument } from '../openapi/document'

/** The OpenAPI 3.1 description of the public API (public: it names routes and fields, no data). */
export default defineApiHandler(() => openApiDocument())
