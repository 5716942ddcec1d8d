//! A test series as a CSV file (the `tightspec friction evaluate` file and
//! the page's upload): one header row naming each column with its unit in
//! brackets, then one row per specimen in test order.
//!
//! Columns: `clamp_force [kN]` (or `[N]`, `[lbf]`), `total_torque [N·m]`
//! (or `[N*m]`, `[Nm]`, `[lbf·in]`, `[lbf·ft]`) and, optionally,
//! `thread_torque [N·m]` (an empty cell means not measured).

use super::wire::SpecimenRequest;
use crate::app::quantity::Quantity;

/// Most specimen rows read from one file (a series is a few dozen).
pub const MAX_ROWS: usize = 10_000;

#[derive(Clone, Copy, PartialEq)]
enum Column {
    ClampForce,
    TotalTorque,
    ThreadTorque,
}

/// Parses the CSV into specimen records; units come from the header.
pub fn specimens_from_csv(text: &str) -> Result<Vec<SpecimenRequest>, String> {
    let mut reader = csv::ReaderBuilder::new()
        .trim(csv::Trim::All)
        .flexible(false)
        .from_reader(text.as_bytes());
    let headers = reader
        .headers()
        .map_err(|e| format!("CSV header: {e}"))?
        .clone();
    let mut columns = Vec::new();
    for h in headers.iter() {
        let (name, unit) = match (h.find('['), h.rfind(']')) {
            (Some(a), Some(b)) if b > a => (h[..a].trim(), h[a + 1..b].trim()),
            _ => {
                return Err(format!(
                    "CSV header '{h}': give the unit in brackets, e.g. 'clamp_force [kN]'"
                ))
            }
        };
        let column = match name {
            "clamp_force" => Column::ClampForce,
            "total_torque" => Column::TotalTorque,
            "thread_torque" => Column::ThreadTorque,
            other => {
                return Err(format!(
                    "CSV header '{other}': unknown column; use clamp_force, total_torque, \
                     thread_torque"
                ))
            }
        };
        if columns.iter().any(|(c, _)| *c == column) {
            return Err(format!("CSV header '{name}' appears twice"));
        }
        columns.push((column, unit.to_owned()));
    }
    for needed in [Column::ClampForce, Column::TotalTorque] {
        if !columns.iter().any(|(c, _)| *c == needed) {
            return Err("CSV needs the columns clamp_force and total_torque".into());
        }
    }
    let mut specimens = Vec::new();
    for (row, record) in reader.records().enumerate() {
        if row >= MAX_ROWS {
            return Err(format!("CSV: more than {MAX_ROWS} specimen rows"));
        }
        let record = record.map_err(|e| format!("CSV row {}: {e}", row + 2))?;
        let mut s = SpecimenRequest {
            clamp_force: None,
            total_torque: None,
            thread_torque: None,
            curve: None,
        };
        for ((column, unit), cell) in columns.iter().zip(record.iter()) {
            if cell.is_empty() {
                continue;
            }
            let value: f64 = cell.parse().map_err(|_| {
                format!(
                    "CSV row {} (specimens[{row}]): '{cell}' is not a number",
                    row + 2
                )
            })?;
            let q = Some(Quantity {
                value,
                unit: unit.clone().into(),
            });
            match column {
                Column::ClampForce => s.clamp_force = q,
                Column::TotalTorque => s.total_torque = q,
                Column::ThreadTorque => s.thread_torque = q,
            }
        }
        specimens.push(s);
    }
    Ok(specimens)
}
