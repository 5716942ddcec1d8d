//! Reference list routes: tightening methods, clamped-part materials and
//! bearing types, each one `app::reference` use case answered with a
//! one-hour `Cache-Control`.

use actix_web::{get, HttpResponse};
use utoipa_actix_web::service_config::ServiceConfig;

use crate::app::reference::{self, BearingTypes, MaterialList, TighteningMethodList};
use crate::http::extract::Query;

use super::auth::Reader;
use super::reference::{cached, UnitsQuery};

pub fn configure(cfg: &mut ServiceConfig) {
    cfg.service(tightening_methods)
        .service(materials)
        .service(bearing_types);
}

/// Tightening methods and their scatter.
#[utoipa::path(tag = "reference", responses((status = 200, description = "Methods", body = TighteningMethodList)))]
#[get("/v1/tightening-methods")]
async fn tightening_methods(_reader: Reader) -> HttpResponse {
    cached(reference::tightening_methods())
}

/// Clamped-part materials with modulus and limiting surface pressure.
#[utoipa::path(tag = "reference", params(UnitsQuery), responses((status = 200, description = "Materials", body = MaterialList)))]
#[get("/v1/materials")]
async fn materials(_reader: Reader, query: Query<UnitsQuery>) -> HttpResponse {
    cached(reference::materials(query.units.unwrap_or_default()))
}

/// The bearing-surface choices: head types, washers and hole series.
#[utoipa::path(tag = "reference", responses((status = 200, description = "Head types, washers and hole series", body = BearingTypes)))]
#[get("/v1/bearing-types")]
async fn bearing_types(_reader: Reader) -> HttpResponse {
    cached(reference::bearing_types())
}
