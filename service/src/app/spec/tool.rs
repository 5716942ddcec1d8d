//! What a tool asks for with its setpoints: its torque unit, its torque and
//! angle resolutions and the error checks the request accepts, read from a
//! setpoint query (`GET /v1/setpoints`) or from a batch item's options.

use crate::app::quantity::TorqueUnit;
use crate::app::{AppError, FieldProblem};

use super::checks::codes_from_query;
use super::request::{SetpointQuery, SpecRequest};

/// A tool's options, read.
#[derive(Debug, Clone, PartialEq)]
pub struct ToolAsk {
    pub unit: TorqueUnit,
    /// Torque resolution in `unit`; `None` is the default
    /// ([`super::setpoints::DEFAULT_RESOLUTION`]).
    pub resolution: Option<f64>,
    /// Angle resolution in degrees; `None` is the default
    /// ([`super::setpoints::DEFAULT_ANGLE_RESOLUTION`]).
    pub angle_resolution: Option<f64>,
    /// Error check codes the request accepts.
    pub accept: Vec<&'static str>,
}

/// The torque unit named in `torque_unit` (default N·m).
pub fn torque_unit(text: Option<&str>) -> Result<TorqueUnit, FieldProblem> {
    match text {
        None => Ok(TorqueUnit::NewtonMetre),
        Some(t) => TorqueUnit::parse("torque_unit", t),
    }
}

impl SetpointQuery {
    /// The spec request and the tool's options of a setpoint query, read
    /// together so that every bad parameter is reported.
    pub fn read(&self) -> Result<(SpecRequest, ToolAsk), AppError> {
        let mut problems: Vec<FieldProblem> = Vec::new();
        let unit = torque_unit(self.torque_unit.as_deref())
            .map_err(|e| problems.push(e))
            .ok();
        let accept = match self.accept_checks.as_deref().map(codes_from_query) {
            None => Some(Vec::new()),
            Some(r) => r.map_err(|e| problems.push(e)).ok(),
        };
        let req = self.to_request().map_err(|e| problems.extend(e)).ok();
        match (unit, accept, req) {
            (Some(unit), Some(accept), Some(req)) => Ok((
                req,
                ToolAsk {
                    unit,
                    resolution: self.resolution,
                    angle_resolution: self.angle_resolution,
                    accept,
                },
            )),
            _ => Err(AppError::Fields(problems)),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn query(torque_unit: &str, accept: &str, clamp_length: &str) -> SetpointQuery {
        SetpointQuery {
            thread: "M10".into(),
            property_class: "8.8".into(),
            torque_unit: Some(torque_unit.into()),
            accept_checks: Some(accept.into()),
            clamp_length: Some(clamp_length.into()),
            resolution: Some(0.5),
            ..SetpointQuery::default()
        }
    }

    #[test]
    fn every_bad_parameter_is_reported_at_once() {
        let e = query("kgf.m", "nope", "40").read().unwrap_err();
        let fields: Vec<&str> = e.problems().iter().map(|p| p.field.as_str()).collect();
        assert_eq!(
            fields,
            ["torque_unit.unit", "accept_checks", "clamp_length"]
        );
    }

    #[test]
    fn a_good_query_gives_the_request_and_the_tool() {
        let (req, tool) = query("lbf.ft", "surface_pressure_exceeded", "40mm")
            .read()
            .unwrap();
        assert_eq!(req.thread, "M10");
        assert_eq!(tool.unit, TorqueUnit::PoundForceFoot);
        assert_eq!(tool.resolution, Some(0.5));
        assert_eq!(tool.accept, ["surface_pressure_exceeded"]);
        assert_eq!(torque_unit(None), Ok(TorqueUnit::NewtonMetre));
    }
}
