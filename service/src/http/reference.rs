//! Reference data from the engine's tables: threads and property classes
//! here; tightening methods, clamped materials and bearing types in
//! `reference_lists` (finishes and lubricants are catalogue items, see
//! `http::catalogue`). Thin handlers: look up,
//! convert to wire types, answer.

use crate::http::extract::Query;
use actix_web::{get, HttpRequest, HttpResponse};
use serde::{Deserialize, Serialize};
use utoipa::{IntoParams, ToSchema};
use utoipa_actix_web::service_config::ServiceConfig;

use crate::engine::grade::{self, GradeInfo};
use crate::engine::thread::{self, ThreadGeometry};

use super::auth::Reader;
use super::error::ApiError;
use super::quantity::{Quantity, Units};

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

/// Basic geometry of one thread.
#[derive(Debug, Serialize, ToSchema)]
pub struct Thread {
    /// Normalised designation, e.g. `M10`, `M10x1.25`, `1/2-13 UNC`.
    pub designation: String,
    /// `iso_metric` (ISO 68-1) or `unified` (ASME B1.1).
    pub form: String,
    /// `coarse`, `fine` (ISO 261), `unc`, `unf`, `un8` (ASME B1.1), `custom`.
    pub series: String,
    pub nominal_diameter: Quantity,
    pub pitch: Quantity,
    /// Threads per inch (Unified threads only).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub threads_per_inch: Option<f64>,
    pub flank_angle: Quantity,
    pub pitch_diameter: Quantity,
    pub minor_diameter: Quantity,
    /// Tensile stress area A_s.
    pub stress_area: Quantity,
}

fn slug<T: Serialize>(value: &T) -> String {
    serde_json::to_value(value)
        .ok()
        .and_then(|v| v.as_str().map(str::to_owned))
        .unwrap_or_default()
}

fn wire_thread(t: &ThreadGeometry, units: Units) -> Thread {
    let tpi = t
        .is_inch()
        .then(|| (1.0 / t.pitch.get::<uom::si::length::inch>() * 1e6).round() / 1e6);
    Thread {
        designation: t.designation.clone(),
        form: slug(&t.form),
        series: slug(&t.series),
        nominal_diameter: Quantity::length(t.nominal_diameter, units),
        pitch: Quantity::length(t.pitch, units),
        threads_per_inch: tpi,
        flank_angle: Quantity::angle(t.flank_angle),
        pitch_diameter: Quantity::length(t.pitch_diameter, units),
        minor_diameter: Quantity::length(t.minor_diameter, units),
        stress_area: Quantity::area(t.stress_area, units),
    }
}

/// Every tabulated thread: ISO 261 metric coarse and fine, ASME B1.1 UNC,
/// UNF and 8-UN.
#[utoipa::path(
    tag = "reference",
    params(ThreadsQuery),
    responses(
        (status = 200, description = "Tabulated threads", body = Vec<Thread>),
        (status = 400, description = "Unknown parameter or series", body = super::error::Problem, content_type = "application/problem+json")
    )
)]
#[get("/v1/threads")]
async fn threads(_reader: Reader, query: Query<ThreadsQuery>) -> Result<HttpResponse, ApiError> {
    let units = query.units.unwrap_or_default();
    const SERIES: [&str; 5] = ["coarse", "fine", "unc", "unf", "un8"];
    if let Some(s) = &query.series {
        if !SERIES.contains(&s.as_str()) {
            let known: Vec<String> = SERIES.iter().map(|s| s.to_string()).collect();
            return Err(ApiError::Malformed {
                detail: format!("series: unknown series '{s}'"),
                errors: vec![super::error::FieldError::new(
                    "series",
                    format!("unknown series '{s}'; use one of {}", SERIES.join(", ")),
                )
                .with_suggestions(super::extract::suggest(s, &known))],
            });
        }
    }
    let list: Vec<Thread> = thread::standard_threads()
        .filter(|t| query.series.as_deref().is_none_or(|s| slug(&t.series) == s))
        .map(|t| wire_thread(&t, units))
        .collect();
    Ok(cached(list))
}

/// One thread by designation (URL-encode it: `1%2F2-13%20UNC`). Also
/// accepts non-tabulated metric designations with an explicit pitch.
#[utoipa::path(
    tag = "reference",
    params(("designation" = String, Path, description = "e.g. `M10`, `M10x1.25`, `1/2-13 UNC`"), UnitsQuery),
    responses(
        (status = 200, description = "Thread geometry", body = Thread),
        (status = 400, description = "Not a thread designation", body = super::error::Problem, content_type = "application/problem+json"),
        (status = 404, description = "Unknown thread, with suggestions", body = super::error::Problem, content_type = "application/problem+json")
    )
)]
#[get("/v1/threads/{designation}")]
async fn thread_detail(
    _reader: Reader,
    req: HttpRequest,
    query: Query<UnitsQuery>,
) -> Result<HttpResponse, ApiError> {
    let designation = path_segment(&req, "designation");
    let t = thread::parse_designation(&designation)?;
    Ok(cached(wire_thread(&t, query.units.unwrap_or_default())))
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

/// Strengths of a grade over one size range.
#[derive(Debug, Serialize, ToSchema)]
pub struct SizeRangeWire {
    /// The range as a person reads it, e.g. `over M16 to M39`.
    pub label: String,
    pub min_diameter: Quantity,
    /// Whether `min_diameter` itself belongs to the range.
    pub min_inclusive: bool,
    pub max_diameter: Quantity,
    pub tensile_strength_min: Quantity,
    pub yield_strength_min: Quantity,
    /// Proof stress S_p (proof load = S_p · A_s).
    pub proof_stress: Quantity,
}

/// A strength grade (property class).
#[derive(Debug, Serialize, ToSchema)]
pub struct PropertyClass {
    /// As the API spells it: `8.8`, `A2-70`, `sae-j429-5`, `astm-a574`.
    pub id: String,
    pub name: String,
    pub standard: String,
    /// `iso898`, `iso3506`, `sae_j429`, `astm_a574`.
    pub family: String,
    /// Which yield value the standard specifies (`lower_yield`,
    /// `proof_strength02`, `full_size_rpf`, `inch_yield`).
    pub yield_basis: String,
    pub size_ranges: Vec<SizeRangeWire>,
    pub notes: Vec<String>,
}

fn wire_grade(g: &GradeInfo, units: Units) -> PropertyClass {
    PropertyClass {
        id: g.id.to_string(),
        name: g.name.to_string(),
        standard: g.standard.to_string(),
        family: slug(&g.family),
        yield_basis: slug(&g.yield_basis),
        size_ranges: g
            .size_ranges
            .iter()
            .map(|r| SizeRangeWire {
                label: r.label.to_string(),
                min_diameter: Quantity::length(r.min_diameter, units),
                min_inclusive: r.min_inclusive,
                max_diameter: Quantity::length(r.max_diameter, units),
                tensile_strength_min: Quantity::stress(r.tensile_strength_min, units),
                yield_strength_min: Quantity::stress(r.yield_strength_min, units),
                proof_stress: Quantity::stress(r.proof_stress, units),
            })
            .collect(),
        notes: g.notes.iter().map(|n| n.to_string()).collect(),
    }
}

/// Every property class: ISO 898-1, ISO 3506-1, SAE J429, ASTM A574.
#[utoipa::path(
    tag = "reference",
    params(UnitsQuery),
    responses((status = 200, description = "Property classes", body = Vec<PropertyClass>))
)]
#[get("/v1/property-classes")]
async fn property_classes(_reader: Reader, query: Query<UnitsQuery>) -> HttpResponse {
    let units = query.units.unwrap_or_default();
    let list: Vec<PropertyClass> = grade::property_classes()
        .iter()
        .map(|g| wire_grade(g, units))
        .collect();
    cached(list)
}

/// One property class with its strengths per size range.
#[utoipa::path(
    tag = "reference",
    params(("id" = String, Path, description = "e.g. `8.8`, `10.9`, `A2-70`, `sae-j429-5`"), UnitsQuery),
    responses(
        (status = 200, description = "Property class", body = PropertyClass),
        (status = 404, description = "Unknown property class, with suggestions", body = super::error::Problem, content_type = "application/problem+json")
    )
)]
#[get("/v1/property-classes/{id}")]
async fn property_class_detail(
    _reader: Reader,
    req: HttpRequest,
    query: Query<UnitsQuery>,
) -> Result<HttpResponse, ApiError> {
    let id = path_segment(&req, "id");
    let g = grade::find_property_class(&id)?;
    Ok(cached(wire_grade(g, query.units.unwrap_or_default())))
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
