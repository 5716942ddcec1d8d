//! `tightspec openapi`: prints the OpenAPI document, byte for byte what
//! `GET /openapi.json` serves and `openapi/openapi.json` holds.

pub fn run() -> Result<String, String> {
    crate::startup::openapi_document()
        .map_err(|e| format!("cannot render the OpenAPI document: {e}"))
}
