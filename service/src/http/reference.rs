//! Reference routes: threads and property classes here; tightening
//! methods, clamped materials and bearing types in `reference_lists`. Each
//! handler calls one `app::reference` use case and answers its view with a
//! one-hour `Cache-Control` (finishes and lubricants are catalogue items,
//! see `http::catalogue`).

use crate::http::extract::Query;
use actix_web::{get, HttpRequest, HttpResponse};
use serde::{Deserialize, Serialize};
use utoipa::IntoParams;
use utoipa_actix_web::service_config::ServiceConfig;

use crate::app::reference::{self, PropertyClass, Thread};

use super::auth::Reader;
use super::error::ApiError;
use crate::app::quantity::Units;

pub fn configure(cfg: &mut ServiceConfig) {
    cfg.service(threads)
        .service(thread_detail)
        .service(property_classes)
        .service(property_class_detail);
    super::reference_lists::configure(cfg);
}

/// Reference data changes only with a release: clients may keep it an hour.
const CACHE_CONTROL: &str = "public, max-age=3600";

/// `?units=si|us`; nothing else is accepted.
#[derive(Debug, Default, Deserialize, IntoParams)]
#[serde(deny_unknown_fields)]
#[into_params(parameter_in = Query)]
pub struct UnitsQuery {
    /// `si` (default) or `us`.
    #[param(value_type = Option<Units>)]
    pub units: Option<Units>,
}

/// `?units=&series=` for the thread list.
#[derive(Debug, Default, Deserialize, IntoParams)]
#[serde(deny_unknown_fields)]
#[into_params(parameter_in = Query)]
pub struct ThreadsQuery {
    /// `si` (default) or `us`.
    #[param(value_type = Option<Units>)]
    pub units: Option<Units>,
    /// Only this series: `coarse`, `fine`, `unc`, `unf`, `un8`.
    #[param(pattern = "^(coarse|fine|unc|unf|un8)$")]
    pub series: Option<String>,
}

/// Every tabulated thread: ISO 261 metric coarse and fine, ASME B1.1 UNC,
/// UNF and 8-UN.
#[utoipa::path(
    tag = "reference",
    params(ThreadsQuery),
    responses(
        (status = 200, description = "Tabulated threads", body = Vec<Thread>),
        (status = 400, description = "Unknown parameter or series")
    )
)]
#[get("/v1/threads")]
async fn threads(_reader: Reader, query: Query<ThreadsQuery>) -> Result<HttpResponse, ApiError> {
    let units = query.units.unwrap_or_default();
    Ok(cached(reference::threads(query.series.as_deref(), units)?))
}

/// One thread by designation (URL-encode it: `1%2F2-13%20UNC`). Also
/// accepts non-tabulated metric designations with an explicit pitch.
#[utoipa::path(
    tag = "reference",
    params(("designation" = String, Path, description = "e.g. `M10`, `M10x1.25`, `1/2-13 UNC`"), UnitsQuery),
    responses(
        (status = 200, description = "Thread geometry", body = Thread),
        (status = 400, description = "Not a thread designation"),
        (status = 404, description = "Unknown thread, with suggestions")
    )
)]
#[get("/v1/threads/{designation}")]
async fn thread_detail(
    _reader: Reader,
    req: HttpRequest,
    query: Query<UnitsQuery>,
) -> Result<HttpResponse, ApiError> {
    let designation = path_segment(&req, "designation");
    let units = query.units.unwrap_or_default();
    Ok(cached(reference::thread(&designation, units)?))
}

/// A path segment, fully percent-decoded (`%2F` included, so inch
/// designations such as `1/2-13 UNC` can be addressed).
fn path_segment(req: &HttpRequest, name: &str) -> String {
    let raw = req.match_info().get(name).unwrap_or_default();
    percent_decode(raw)
}

fn percent_decode(text: &str) -> String {
    fn hex(b: u8) -> Option<u8> {
        (b as char).to_digit(16).map(|d| d as u8)
    }
    let bytes = text.as_bytes();
    let mut out = Vec::with_capacity(bytes.len());
    let mut i = 0;
    while i < bytes.len() {
        if bytes[i] == b'%' && i + 2 < bytes.len() {
            if let (Some(hi), Some(lo)) = (hex(bytes[i + 1]), hex(bytes[i + 2])) {
                out.push(hi * 16 + lo);
                i += 3;
                continue;
            }
        }
        out.push(bytes[i]);
        i += 1;
    }
    String::from_utf8_lossy(&out).into_owned()
}

/// Every property class: ISO 898-1, ISO 3506-1, SAE J429, ASTM A574.
#[utoipa::path(
    tag = "reference",
    params(UnitsQuery),
    responses((status = 200, description = "Property classes", body = Vec<PropertyClass>))
)]
#[get("/v1/property-classes")]
async fn property_classes(_reader: Reader, query: Query<UnitsQuery>) -> HttpResponse {
    cached(reference::property_classes(query.units.unwrap_or_default()))
}

/// One property class with its strengths per size range.
#[utoipa::path(
    tag = "reference",
    params(("id" = String, Path, description = "e.g. `8.8`, `10.9`, `A2-70`, `sae-j429-5`"), UnitsQuery),
    responses(
        (status = 200, description = "Property class", body = PropertyClass),
        (status = 404, description = "Unknown property class, with suggestions")
    )
)]
#[get("/v1/property-classes/{id}")]
async fn property_class_detail(
    _reader: Reader,
    req: HttpRequest,
    query: Query<UnitsQuery>,
) -> Result<HttpResponse, ApiError> {
    let id = path_segment(&req, "id");
    let units = query.units.unwrap_or_default();
    Ok(cached(reference::property_class(&id, units)?))
}

pub(super) fn cached<T: Serialize>(body: T) -> HttpResponse {
    HttpResponse::Ok()
        .insert_header((actix_web::http::header::CACHE_CONTROL, CACHE_CONTROL))
        .json(body)
}

#[cfg(test)]
mod tests {
    use super::percent_decode;

    #[test]
    fn percent_decoding_handles_slashes_and_spaces() {
        assert_eq!(percent_decode("1%2F2-13%20UNC"), "1/2-13 UNC");
        assert_eq!(percent_decode("M10"), "M10");
        assert_eq!(percent_decode("bad%zz"), "bad%zz");
        assert_eq!(percent_decode("end%2"), "end%2");
    }
}
