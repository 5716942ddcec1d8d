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

#[test]
fn every_field_list_is_summed_up_in_one_wording() {
    let one = ApiError::invalid("clamp_length", "must be above zero").problem();
    assert_eq!(one.detail, "clamp_length: must be above zero");
    let two = ApiError::unprocessable(vec![
        FieldError::new("entries[0].finish", "unknown finish 'x'"),
        FieldError::new("entries[1].lubricant", "unknown lubricant 'y'"),
    ])
    .problem();
    assert_eq!(
        two.detail,
        "2 problems in the request: entries[0].finish, entries[1].lubricant"
    );
    let from_app: ApiError = AppError::Fields(vec![
        crate::app::FieldProblem::invalid("entries[0].finish", "unknown finish 'x'"),
        crate::app::FieldProblem::invalid("entries[1].lubricant", "unknown lubricant 'y'"),
    ])
    .into();
    assert_eq!(
        from_app.problem().detail,
        two.detail,
        "the same words either way"
    );
}
