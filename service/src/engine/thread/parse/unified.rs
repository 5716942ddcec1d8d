//! Unified (inch) designations: the size token (fraction, mixed number,
//! decimal, number size or whole inch), the threads per inch and the series,
//! matched against the tabulated UNC, UNF and 8-UN pitches.

use super::*;

/// Which Unified sizes a size token may mean.
struct SizeToken {
    /// Candidate diameter as a number size (#2–#12).
    numbered: Option<f64>,
    /// Candidate diameter in inches (fraction, decimal or whole inch).
    inches: Option<f64>,
}

fn unified_size(c: &mut Cursor) -> Result<SizeToken, EngineError> {
    let bad = || malformed("expected an inch size such as 1/2, 1-1/4, 0.500 or #10");
    if c.eat(b'#') {
        c.skip_ws();
        let n = c.integer().ok_or_else(bad)?;
        return Ok(SizeToken {
            numbered: Some(0.060 + 0.013 * f64::from(n)),
            inches: None,
        });
    }
    let (value, had_point) = c.decimal(false).ok_or_else(bad)?;
    if had_point {
        return Ok(SizeToken {
            numbered: None,
            inches: Some(value),
        });
    }
    let whole = value as u32;
    c.skip_ws();
    if c.eat(b'/') {
        c.skip_ws();
        let den = c.integer().filter(|d| *d > 0).ok_or_else(bad)?;
        return Ok(SizeToken {
            numbered: None,
            inches: Some(f64::from(whole) / f64::from(den)),
        });
    }
    // Mixed number `1-1/4`: a dash, digits, then a slash.
    let save = c.i;
    if c.eat(b'-') {
        c.skip_ws();
        if let Some(num) = c.integer() {
            c.skip_ws();
            if c.eat(b'/') {
                c.skip_ws();
                let den = c.integer().filter(|d| *d > 0).ok_or_else(bad)?;
                return Ok(SizeToken {
                    numbered: None,
                    inches: Some(f64::from(whole) + f64::from(num) / f64::from(den)),
                });
            }
        }
    }
    c.i = save;
    Ok(SizeToken {
        numbered: (2..=12)
            .contains(&whole)
            .then(|| 0.060 + 0.013 * f64::from(whole)),
        inches: (1..=2).contains(&whole).then_some(f64::from(whole)),
    })
}

#[derive(Clone, Copy, PartialEq)]
enum Wanted {
    Any,
    Unc,
    Unf,
    Un,
}

pub(super) fn unified(c: &mut Cursor) -> Result<ThreadGeometry, EngineError> {
    let size = unified_size(c)?;
    c.skip_ws();
    if !c.eat(b'-') {
        return Err(malformed(
            "expected '-' and threads per inch after the size, e.g. 1/2-13",
        ));
    }
    c.skip_ws();
    let tpi = c
        .integer()
        .filter(|n| *n > 0)
        .ok_or_else(|| malformed("expected threads per inch after '-', e.g. 1/2-13"))?;
    c.skip_ws();
    let mut wanted = Wanted::Any;
    let mut buf = [0u8; 8];
    if c.peek().is_some_and(|b| b.is_ascii_alphabetic()) {
        let word = c
            .word(&mut buf)
            .ok_or_else(|| malformed("thread series suffix is too long"))?;
        wanted = match word {
            b"unc" | b"unrc" => Wanted::Unc,
            b"unf" | b"unrf" => Wanted::Unf,
            b"un" | b"unr" => Wanted::Un,
            other => {
                return Err(EngineError::Unknown {
                    field: FIELD.into(),
                    kind: "thread series",
                    given: String::from_utf8_lossy(other).to_uppercase(),
                    suggestions: vec!["UNC".into(), "UNF".into(), "UN".into()],
                })
            }
        };
        c.skip_ws();
    }
    if c.eat(b'-') {
        c.skip_ws();
    }
    if !c.at_end() {
        // Class of fit 1A/2A/3A/1B/2B/3B: accepted and ignored.
        let mut cls = [0u8; 8];
        match c.word(&mut cls) {
            Some([b'1' | b'2' | b'3', b'a' | b'b']) => {}
            _ => return Err(malformed("unexpected text after the Unified designation")),
        }
        c.skip_ws();
        if !c.at_end() {
            return Err(malformed("unexpected text after the class of fit"));
        }
    }
    let find = |d: Option<f64>| -> Option<&'static UnifiedSize> {
        let d = d?;
        UNIFIED.iter().find(|s| (s.d - d).abs() < SIZE_TOLERANCE)
    };
    let candidates = [find(size.numbered), find(size.inches)];
    for s in candidates.iter().flatten() {
        if let Some(g) = match_pitch(s, tpi, wanted) {
            return Ok(g);
        }
    }
    match candidates.iter().flatten().next() {
        Some(s) => Err(EngineError::Invalid {
            field: FIELD.into(),
            reason: format!("{}-{tpi} is not a tabulated ASME B1.1 thread", s.name),
            suggestions: unified_pitches(s),
        }),
        None => Err(nearest_unified(
            size.inches.or(size.numbered).unwrap_or(0.0),
        )),
    }
}

fn match_pitch(s: &UnifiedSize, tpi: u32, wanted: Wanted) -> Option<ThreadGeometry> {
    let make = |series, label| {
        Some(unified_geometry(
            unified_designation(s, tpi, label),
            series,
            s.d,
            f64::from(tpi),
        ))
    };
    let any = wanted == Wanted::Any;
    if (any || wanted == Wanted::Unc) && s.unc == Some(tpi) {
        return make(ThreadSeries::Unc, "UNC");
    }
    if (any || wanted == Wanted::Unf) && s.unf == Some(tpi) {
        return make(ThreadSeries::Unf, "UNF");
    }
    if (any || wanted == Wanted::Un) && s.un8 && tpi == 8 {
        return make(ThreadSeries::Un8, "UN");
    }
    None
}

fn unified_pitches(s: &UnifiedSize) -> Vec<String> {
    let mut v = Vec::new();
    if let Some(n) = s.unc {
        v.push(unified_designation(s, n, "UNC"));
    }
    if let Some(n) = s.unf {
        v.push(unified_designation(s, n, "UNF"));
    }
    if s.un8 {
        v.push(unified_designation(s, 8, "UN"));
    }
    v
}

fn nearest_unified(d: f64) -> EngineError {
    let mut sizes: Vec<&UnifiedSize> = UNIFIED.iter().collect();
    sizes.sort_by(|a, b| (a.d - d).abs().total_cmp(&(b.d - d).abs()));
    EngineError::Invalid {
        field: FIELD.into(),
        reason: format!(
            "{d} in is not a Unified size tabulated here (#2 to 1-1/2 in UNC/UNF, 8-UN to 2 in)"
        ),
        suggestions: sizes
            .iter()
            .take(2)
            .flat_map(|s| unified_pitches(s))
            .collect(),
    }
}
