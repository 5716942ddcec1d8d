//! One batch item as read: a spec request, and whether it asks for the
//! spec (the default) or for tool setpoints with the tool's unit,
//! resolutions and the error checks it accepts.
//!
//! The item is one flat JSON object: the spec request's fields plus
//! `answer` (`"spec"` or `"setpoints"`) and, for setpoints, `torque_unit`,
//! `resolution`, `angle_resolution` and `accept_checks` (a list of check
//! codes), the names of the `GET /v1/setpoints` parameters. An item with
//! none of these is read as a spec request directly; otherwise those keys
//! are taken out and the rest is read as the spec request, so an unknown
//! key is still refused.

use serde::de::DeserializeOwned;
use serde::{Deserialize, Serialize};
use serde_json::value::RawValue;
use serde_json::{Map, Value};
use utoipa::ToSchema;

use crate::app::spec::checks::{known_codes, ACCEPT_FIELD};
use crate::app::spec::tool::{torque_unit, ToolAsk};
use crate::app::spec::SpecRequest;
use crate::app::AppError;
use crate::http::error::ApiError;

/// What a batch item asks for.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize, ToSchema)]
#[serde(rename_all = "lowercase")]
pub enum AnswerKind {
    /// The full tightening spec (default).
    #[default]
    Spec,
    /// Tool setpoints, as `GET /v1/setpoints` answers them.
    Setpoints,
}

/// The keys of a batch item beyond the spec request.
#[derive(Debug, Clone, Default, Serialize, Deserialize, ToSchema)]
#[serde(deny_unknown_fields)]
pub struct AnswerOptions {
    /// `spec` (default) or `setpoints`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub answer: Option<AnswerKind>,
    /// Setpoints only: torque unit of the tool (`N·m` default, `lbf·ft`, `lbf·in`).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub torque_unit: Option<String>,
    /// Setpoints only: torque resolution in `torque_unit`; default 0.1.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub resolution: Option<f64>,
    /// Setpoints only: angle resolution in degrees; default 1.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub angle_resolution: Option<f64>,
    /// Setpoints only: the error-severity check codes accepted. While an
    /// error check applies that is not named here, the item is a 422
    /// problem listing the checks.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub accept_checks: Option<Vec<String>>,
}

/// One batch item: a spec request and the options of its answer (the
/// shape documented in the OpenAPI document).
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct BatchItemRequest {
    #[serde(flatten)]
    pub request: SpecRequest,
    #[serde(flatten)]
    pub answer: AnswerOptions,
}

/// What an item asks for, read.
#[derive(Debug, Clone, PartialEq)]
pub enum Answer {
    Spec,
    Setpoints(ToolAsk),
}

/// One item read.
#[derive(Debug, Clone, PartialEq)]
pub struct ItemRequest {
    pub spec: SpecRequest,
    pub answer: Answer,
}

/// The first `name` in backticks of a serde message ("unknown field `thred`").
fn backticked(message: &str) -> Option<String> {
    let rest = message.split_once('`')?.1;
    Some(rest.split_once('`')?.0.to_string())
}

fn malformed(e: serde_json::Error) -> ApiError {
    let message = e.to_string();
    let field = backticked(&message).unwrap_or_else(|| "item".to_string());
    ApiError::malformed(field, message)
}

/// The spec part of an item; a malformed one names its field: the path
/// serde was at, else the name an unknown-field message quotes, else
/// `item` (a quoted value such as a bad variant is never taken for a field
/// name).
fn read_spec(map: Map<String, Value>) -> Result<SpecRequest, ApiError> {
    serde_path_to_error::deserialize(Value::Object(map)).map_err(|e| {
        let path = e.path().to_string();
        let message = e.inner().to_string();
        let field = if path.is_empty() || path == "." {
            Some(message.as_str())
                .filter(|m| m.starts_with("unknown field"))
                .and_then(backticked)
                .filter(|f| !f.is_empty())
                .unwrap_or_else(|| "item".to_string())
        } else {
            path
        };
        ApiError::malformed(field, message)
    })
}

/// One raw item read as a spec or setpoint request; a malformed one names
/// its field.
pub fn read_item(raw: &RawValue) -> Result<ItemRequest, ApiError> {
    // The common case: a plain spec request.
    if let Ok(spec) = serde_json::from_str::<SpecRequest>(raw.get()) {
        return Ok(ItemRequest {
            spec,
            answer: Answer::Spec,
        });
    }
    let mut map: Map<String, Value> = serde_json::from_str(raw.get()).map_err(malformed)?;
    let options = AnswerOptions {
        answer: take(&mut map, "answer")?,
        torque_unit: take(&mut map, "torque_unit")?,
        resolution: take(&mut map, "resolution")?,
        angle_resolution: take(&mut map, "angle_resolution")?,
        accept_checks: take(&mut map, ACCEPT_FIELD)?,
    };
    let spec = read_spec(map)?;
    Ok(ItemRequest {
        spec,
        answer: answer(options)?,
    })
}

/// One option key taken out of the item and read; a bad value names the key.
fn take<T: DeserializeOwned>(
    map: &mut Map<String, Value>,
    key: &str,
) -> Result<Option<T>, ApiError> {
    match map.remove(key) {
        None => Ok(None),
        Some(v) => serde_json::from_value(v)
            .map(Some)
            .map_err(|e| ApiError::malformed(key, e.to_string())),
    }
}

fn answer(o: AnswerOptions) -> Result<Answer, ApiError> {
    if o.answer.unwrap_or_default() == AnswerKind::Spec {
        let given = [
            ("torque_unit", o.torque_unit.is_some()),
            ("resolution", o.resolution.is_some()),
            ("angle_resolution", o.angle_resolution.is_some()),
            (ACCEPT_FIELD, o.accept_checks.is_some()),
        ];
        if let Some((field, _)) = given.iter().find(|(_, g)| *g) {
            return Err(ApiError::malformed(
                *field,
                "applies only to an item with \"answer\": \"setpoints\"",
            ));
        }
        return Ok(Answer::Spec);
    }
    let unit = torque_unit(o.torque_unit.as_deref()).map_err(AppError::from)?;
    let codes = o.accept_checks.unwrap_or_default();
    let accept =
        known_codes(ACCEPT_FIELD, codes.iter().map(String::as_str)).map_err(AppError::from)?;
    Ok(Answer::Setpoints(ToolAsk {
        unit,
        resolution: o.resolution,
        angle_resolution: o.angle_resolution,
        accept,
    }))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::app::quantity::TorqueUnit;

    fn read(json: &str) -> Result<ItemRequest, ApiError> {
        let raw: Box<RawValue> = serde_json::from_str(json).unwrap();
        read_item(&raw)
    }

    fn field(e: ApiError) -> String {
        e.problem().errors[0].field.clone()
    }

    #[test]
    fn spec_by_default_setpoints_when_asked() {
        let plain = read(r#"{"thread":"M10","property_class":"8.8"}"#).unwrap();
        assert_eq!(plain.answer, Answer::Spec);
        let spec = read(r#"{"thread":"M10","property_class":"8.8","answer":"spec"}"#).unwrap();
        assert_eq!(spec.answer, Answer::Spec);
        let sp = read(
            r#"{"thread":"M10","property_class":"8.8","answer":"setpoints",
                "torque_unit":"lbf.ft","resolution":0.5,
                "accept_checks":["surface_pressure_exceeded"]}"#,
        )
        .unwrap();
        assert_eq!(sp.spec.thread, "M10");
        let Answer::Setpoints(ask) = sp.answer else {
            panic!("{sp:?}")
        };
        assert_eq!(ask.unit, TorqueUnit::PoundForceFoot);
        assert_eq!(ask.resolution, Some(0.5));
        assert_eq!(ask.accept, ["surface_pressure_exceeded"]);
    }

    #[test]
    fn bad_options_name_their_field() {
        let base = r#""thread":"M10","property_class":"8.8""#;
        let e = read(&format!(r#"{{{base},"answer":"torque"}}"#)).unwrap_err();
        assert_eq!(field(e), "answer");
        let e = read(&format!(r#"{{{base},"resolution":0.5}}"#)).unwrap_err();
        assert_eq!(field(e), "resolution");
        let e = read(&format!(
            r#"{{{base},"answer":"setpoints","accept_checks":["nope"]}}"#
        ))
        .unwrap_err();
        assert_eq!(field(e), ACCEPT_FIELD);
        let e = read(&format!(r#"{{{base},"answer":"setpoints","thred":"M8"}}"#)).unwrap_err();
        assert_eq!(field(e), "thred");
        let e = read(&format!(
            r#"{{{base},"answer":"setpoints","torque_unit":"kgf.m"}}"#
        ))
        .unwrap_err();
        assert!(field(e).starts_with("torque_unit"));
    }
}
