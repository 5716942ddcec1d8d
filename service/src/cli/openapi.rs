//! `tightspec openapi`: prints the OpenAPI document, byte for byte what
//! `GET /openapi.json` serves and `openapi/openapi.json` holds.

pub fn run() -> Result<String, String> {
    crate::http::openapi::document_json()
        .map_err(|e| format!("cannot render the OpenAPI document: {e}"))
}
