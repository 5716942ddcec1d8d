//! One dimensional query value: a number and its unit.

use crate::app::quantity::Quantity;
use crate::app::FieldProblem;

/// Reads a query value such as `40mm`, `40 mm`, `1.5in`, `2N·m` into a
/// quantity. A bare number is refused: the unit must be stated.
pub fn quantity_from_query(field: &str, text: &str) -> Result<Quantity, FieldProblem> {
    let t = text.trim();
    let split = t
        .char_indices()
        .find(|&(i, c)| {
            !(c.is_ascii_digit()
                || c == '.'
                || ((c == '-' || c == '+') && (i == 0 || t[..i].ends_with(['e', 'E'])))
                || ((c == 'e' || c == 'E')
                    && i > 0
                    && t[i + 1..]
                        .starts_with(|d: char| d.is_ascii_digit() || d == '-' || d == '+')))
        })
        .map(|(i, _)| i)
        .unwrap_or(t.len());
    let (number, unit) = t.split_at(split);
    let unit = unit.trim();
    let value: f64 = number.parse().map_err(|_| {
        FieldProblem::malformed(
            field,
            format!("'{text}' is not a number followed by a unit"),
        )
    })?;
    if !value.is_finite() {
        return Err(FieldProblem::malformed(
            field,
            format!("'{text}': the number is too large to represent"),
        ));
    }
    if unit.is_empty() {
        return Err(FieldProblem::malformed(
            field,
            format!("'{text}' has no unit; write it with one, e.g. 40mm, 1.5in, 20kN, 2N·m"),
        ));
    }
    Ok(Quantity {
        value,
        unit: unit.to_string().into(),
    })
}
