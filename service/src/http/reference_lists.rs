//! Reference list routes: tightening methods, clamped-part materials,
//! bearing types and nut classes, each one `app::reference` use case answered with a
//! one-hour `Cache-Control`.

use actix_web::{get, HttpResponse};
use utoipa_actix_web::service_config::ServiceConfig;

use crate::app::reference::{self, BearingTypes, MaterialList, NutClassList, TighteningMethodList};
use crate::http::extract::Query;

use super::auth::Reader;
use super::reference::{cached, UnitsQuery};

pub fn configure(cfg: &mut ServiceConfig) {
    cfg.service(tightening_methods)
        .service(materials)
        .service(bearing_types)
        .service(nut_classes);
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

/// Nut property classes (ISO 898-2, SAE J995, ASTM A563) with their size
/// ranges, proof stresses and the bolts they are made for: the values of
/// `nut.property_class`.
#[utoipa::path(tag = "reference", params(UnitsQuery), responses((status = 200, description = "Nut classes", body = NutClassList)))]
#[get("/v1/nut-classes")]
async fn nut_classes(_reader: Reader, query: Query<UnitsQuery>) -> HttpResponse {
    cached(reference::nut_classes(query.units.unwrap_or_default()))
}
