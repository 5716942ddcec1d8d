//! Joints as CSV, one row per joint, with a header row (UTF-8, a leading
//! byte-order mark allowed on import and written on request for
//! spreadsheets). The columns: `id`, `title`, `tags` (`;`-separated),
//! `torque_unit`, `resolution`, `angle_resolution` (the tool presentation),
//! then the spec request as the flat parameters of
//! `GET /v1/tightening-specs` (`thread`, `property_class`, `finish`, …,
//! a quantity written with its unit, e.g. `40mm`; `clamped_parts` as
//! `THICKNESS:MATERIAL,…`). An empty cell is an absent value. A request
//! that has no flat form (reduced shank sections) is refused by the CSV
//! export with the joint named: export it as JSON.

use std::collections::BTreeMap;

use serde_json::{json, Value};
use utoipa::openapi::path::ParameterIn;
use utoipa::IntoParams;

use super::{normalized, reason, under, ImportReport, IMPORT_MAX};
use crate::app::spec::SpecQuery;
use crate::app::{App, AppError, FieldProblem};
use crate::registry::JointDefinition;

/// The columns before the spec request's.
const DEFINITION_COLUMNS: [&str; 6] = [
    "id",
    "title",
    "tags",
    "torque_unit",
    "resolution",
    "angle_resolution",
];

/// The spec request's columns: the names of the spec GET query.
fn spec_columns() -> Vec<String> {
    SpecQuery::into_params(|| Some(ParameterIn::Query))
        .into_iter()
        .map(|p| p.name)
        .collect()
}

/// Every column, in the order an export writes them.
pub fn columns() -> Vec<String> {
    DEFINITION_COLUMNS
        .iter()
        .map(|c| c.to_string())
        .chain(spec_columns())
        .collect()
}

/// A spec request from its flat cells (`column`, `text`), as the GET query
/// would read them; problems are named by column.
fn request_from_cells(cells: &[(String, String)]) -> Result<Value, Vec<FieldProblem>> {
    let query = serde_urlencoded::to_string(cells)
        .map_err(|e| vec![FieldProblem::invalid("thread", e.to_string())])?;
    let de = serde_urlencoded::Deserializer::new(form_urlencoded::parse(query.as_bytes()));
    let flat: SpecQuery = serde_path_to_error::deserialize(de).map_err(|e| {
        let message = e.inner().to_string();
        let path = e.path().to_string();
        let field = if path.is_empty() || path == "." {
            message
                .split_once('`')
                .and_then(|(_, rest)| rest.split_once('`'))
                .map(|(name, _)| name.to_string())
                .unwrap_or_else(|| "thread".into())
        } else {
            path
        };
        vec![FieldProblem::invalid(field, message)]
    })?;
    let request = flat.to_request()?;
    serde_json::to_value(request).map_err(|e| vec![FieldProblem::invalid("thread", e.to_string())])
}

/// A definition body read from one row; the problems named by column.
fn definition_from_row(row: &BTreeMap<&str, &str>) -> Result<Value, Vec<FieldProblem>> {
    let mut problems = Vec::new();
    let cell = |c: &str| row.get(c).copied().filter(|t| !t.trim().is_empty());
    let tags: Vec<&str> = cell("tags")
        .map(|t| {
            t.split(';')
                .map(str::trim)
                .filter(|t| !t.is_empty())
                .collect()
        })
        .unwrap_or_default();
    let mut setpoints = serde_json::Map::new();
    if let Some(u) = cell("torque_unit") {
        setpoints.insert("torque_unit".into(), json!(u.trim()));
    }
    for name in ["resolution", "angle_resolution"] {
        if let Some(t) = cell(name) {
            match t.trim().parse::<f64>() {
                Ok(x) => {
                    setpoints.insert(name.into(), json!(x));
                }
                Err(_) => problems.push(FieldProblem::invalid(
                    name,
                    format!("'{t}' is not a number"),
                )),
            }
        }
    }
    let spec: Vec<(String, String)> = row
        .iter()
        .filter(|(c, t)| !DEFINITION_COLUMNS.contains(c) && !t.trim().is_empty())
        .map(|(c, t)| (c.to_string(), t.trim().to_string()))
        .collect();
    let request = request_from_cells(&spec)
        .map_err(|p| problems.extend(p))
        .ok();
    match request {
        Some(request) if problems.is_empty() => Ok(json!({
            "id": row.get("id").copied().unwrap_or(""),
            "title": row.get("title").copied().unwrap_or(""),
            "tags": tags,
            "request": request,
            "setpoints": setpoints,
        })),
        _ => Err(problems),
    }
}

/// A definition's problem under its column: `request.loads.axial` is the
/// column `loads_axial`, `setpoints.resolution` the column `resolution`.
fn column_of(field: &str) -> String {
    let inner = field
        .strip_prefix("request.")
        .or_else(|| field.strip_prefix("setpoints."))
        .unwrap_or(field);
    if inner.starts_with("tags[") {
        return "tags".into();
    }
    inner.replace('.', "_")
}

impl App {
    /// Imports joints from CSV text; `reason` is recorded in the history.
    pub async fn import_joints_csv(
        &self,
        actor: &str,
        text: &str,
        reason_given: Option<&str>,
    ) -> Result<ImportReport, AppError> {
        let mut problems = Vec::new();
        let reason = reason(reason_given, "reason")
            .map_err(|p| problems.push(p))
            .ok();
        let text = text.strip_prefix('\u{feff}').unwrap_or(text);
        let mut reader = ::csv::ReaderBuilder::new()
            .has_headers(true)
            .flexible(false)
            .from_reader(text.as_bytes());
        let header: Vec<String> = match reader.headers() {
            Ok(h) => h.iter().map(|c| c.trim().to_string()).collect(),
            Err(e) => return Err(FieldProblem::invalid("header", e.to_string()).into()),
        };
        let known = columns();
        for (j, c) in header.iter().enumerate() {
            if !known.contains(c) {
                let near = crate::app::reading::suggest(c, &known);
                problems.push(
                    FieldProblem::invalid(format!("header[{j}]"), format!("unknown column '{c}'"))
                        .with_suggestions(near),
                );
            } else if header[..j].contains(c) {
                problems.push(FieldProblem::invalid(
                    format!("header[{j}]"),
                    format!("column '{c}' repeats"),
                ));
            }
        }
        for needed in ["id", "title", "thread", "property_class"] {
            if !header.iter().any(|c| c == needed) {
                problems.push(FieldProblem::invalid(
                    "header",
                    format!("no column '{needed}'"),
                ));
            }
        }
        if !problems.iter().all(|p| p.field == "reason") {
            return Err(AppError::Fields(problems));
        }
        let mut bodies: Vec<(String, Value)> = Vec::new();
        for (i, record) in reader.records().enumerate() {
            let at = format!("rows[{i}]");
            if i >= IMPORT_MAX {
                problems.push(FieldProblem::invalid(
                    "rows",
                    format!("an import holds 1 to {IMPORT_MAX} joints"),
                ));
                break;
            }
            let record = match record {
                Ok(r) => r,
                Err(e) => {
                    problems.push(FieldProblem::invalid(at, e.to_string()));
                    continue;
                }
            };
            let row: BTreeMap<&str, &str> = header
                .iter()
                .map(String::as_str)
                .zip(record.iter())
                .collect();
            match definition_from_row(&row) {
                Ok(body) => bodies.push((at, body)),
                Err(p) => problems.extend(under(&at, p)),
            }
        }
        let items: Vec<(String, &Value)> = bodies.iter().map(|(a, b)| (a.clone(), b)).collect();
        match self.import_checked(actor, &items, reason, problems).await {
            Err(AppError::Fields(p)) => Err(AppError::Fields(
                p.into_iter()
                    .map(|mut p| {
                        if let Some((row, field)) = p.field.split_once("].") {
                            p.field = format!("{row}].{}", column_of(field));
                        }
                        p
                    })
                    .collect(),
            )),
            other => other,
        }
    }
}

/// A JSON value as flat cells: `{value, unit}` as `40mm`, an object's
/// fields as `name_field`, `clamped_parts` as `THICKNESS:MATERIAL,…`.
fn flatten(name: &str, v: &Value, out: &mut BTreeMap<String, String>) -> Result<(), String> {
    let quantity = |q: &Value| -> Option<String> {
        let o = q.as_object().filter(|o| o.len() == 2)?;
        Some(format!(
            "{}{}",
            o.get("value")?.as_f64()?,
            o.get("unit")?.as_str()?
        ))
    };
    match v {
        Value::Null => {}
        Value::String(s) => {
            out.insert(name.into(), s.clone());
        }
        Value::Number(n) => {
            out.insert(name.into(), n.to_string());
        }
        Value::Bool(b) => {
            out.insert(name.into(), b.to_string());
        }
        Value::Object(o) => match quantity(v) {
            Some(q) => {
                out.insert(name.into(), q);
            }
            None => {
                for (k, x) in o {
                    let inner = if name.is_empty() {
                        k.clone()
                    } else {
                        format!("{name}_{k}")
                    };
                    flatten(&inner, x, out)?;
                }
            }
        },
        Value::Array(items) if name == "clamped_parts" => {
            let mut layers = Vec::new();
            for item in items {
                let thickness = item.get("thickness").and_then(quantity);
                let material = item.get("material").and_then(Value::as_str);
                match (thickness, material) {
                    (Some(t), Some(m)) if !m.contains([',', ':']) => {
                        layers.push(format!("{t}:{m}"))
                    }
                    _ => return Err(name.into()),
                }
            }
            out.insert(name.into(), layers.join(","));
        }
        Value::Array(_) => return Err(name.into()),
    }
    Ok(())
}

/// One definition as a CSV row in `columns` order, checked to read back
/// as the same definition; otherwise the problem names the joint.
fn row_of(def: &JointDefinition, columns: &[String]) -> Result<Vec<String>, FieldProblem> {
    let at = format!("joints[{}]", def.id);
    let refuse = |what: &str| {
        FieldProblem::invalid(
            format!("{at}.{what}"),
            "has no CSV form that reads back the same; export this joint as JSON",
        )
    };
    if def.tags.iter().any(|t| t.contains(';') || t.trim() != t) {
        return Err(refuse("tags"));
    }
    let mut cells = BTreeMap::new();
    cells.insert("id".to_string(), def.id.to_string());
    cells.insert("title".to_string(), def.title.clone());
    cells.insert("tags".to_string(), def.tags.join(";"));
    let setpoints = serde_json::to_value(&def.setpoints).map_err(|_| refuse("setpoints"))?;
    flatten("", &setpoints, &mut cells).map_err(|f| refuse(&f))?;
    flatten("", &normalized(&def.request), &mut cells)
        .map_err(|f| refuse(&format!("request.{f}")))?;
    if let Some(extra) = cells.keys().find(|k| !columns.contains(k)) {
        return Err(refuse(&format!("request.{extra}")));
    }
    let row: BTreeMap<&str, &str> = cells
        .iter()
        .map(|(k, v)| (k.as_str(), v.as_str()))
        .collect();
    match definition_from_row(&row) {
        Ok(back) => {
            let back = JointDefinition::from_json(&back).map_err(|_| refuse("request"))?;
            if back.title != def.title
                || back.tags != def.tags
                || back.setpoints != def.setpoints
                || normalized(&back.request) != normalized(&def.request)
            {
                return Err(refuse("request"));
            }
        }
        Err(_) => return Err(refuse("request")),
    }
    Ok(columns
        .iter()
        .map(|c| cells.get(c).cloned().unwrap_or_default())
        .collect())
}

/// The CSV export of `defs` (with a byte-order mark when `bom`); a joint
/// with no CSV form is refused by name, nothing half written.
pub fn export_csv(defs: &[JointDefinition], bom: bool) -> Result<String, AppError> {
    let columns = columns();
    let mut problems = Vec::new();
    let mut w = ::csv::WriterBuilder::new().from_writer(Vec::new());
    let mut write = |cells: &[String]| w.write_record(cells).map_err(|e| e.to_string());
    write(&columns).map_err(|e| FieldProblem::invalid("format", e))?;
    for def in defs {
        match row_of(def, &columns) {
            Ok(row) => write(&row).map_err(|e| FieldProblem::invalid("format", e))?,
            Err(p) => problems.push(p),
        }
    }
    if !problems.is_empty() {
        return Err(AppError::Fields(problems));
    }
    let bytes = w
        .into_inner()
        .map_err(|e| FieldProblem::invalid("format", e.to_string()))?;
    let text =
        String::from_utf8(bytes).map_err(|e| FieldProblem::invalid("format", e.to_string()))?;
    Ok(if bom { format!("\u{feff}{text}") } else { text })
}

#[cfg(test)]
#[path = "csv_form_tests.rs"]
mod tests;
