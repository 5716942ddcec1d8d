use super::*;
use crate::app::AppError;
use crate::engine::EngineError;

/// Engine errors reach HTTP only through the application's error.
fn via_app(e: EngineError) -> ApiError {
    AppError::from(e).into()
}

#[test]
fn engine_errors_map_to_their_status() {
    let bad = via_app(EngineError::malformed("thread", "no size"));
    assert_eq!(bad.status_code(), StatusCode::BAD_REQUEST);
    let unknown = via_app(EngineError::Unknown {
        field: "thread".into(),
        kind: "thread",
        given: "M11".into(),
        suggestions: vec!["M10".into(), "M12".into()],
    });
    assert_eq!(unknown.status_code(), StatusCode::NOT_FOUND);
    let p = unknown.problem();
    assert_eq!(p.errors[0].field, "thread");
    assert_eq!(p.errors[0].suggestions, vec!["M10", "M12"]);
    let invalid = via_app(EngineError::invalid("property_class", "outside size range"));
    assert_eq!(invalid.status_code(), StatusCode::UNPROCESSABLE_ENTITY);
    assert_eq!(invalid.problem().problem_type, "/problems/invalid-input");
}

#[test]
fn internal_detail_is_generic() {
    let p = ApiError::Internal("db password wrong at host x".into()).problem();
    assert!(!p.detail.contains("password"));
    assert_eq!(p.status, 500);
}

#[test]
fn payload_limit_is_stated() {
    let p = ApiError::PayloadTooLarge { limit_bytes: 1024 }.problem();
    assert!(p.detail.contains("1024"));
}
