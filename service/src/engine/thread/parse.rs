//! Hand-written designation parser over bytes (no regex, no allocation on
//! the success path except the normalised designation string).
//!
//! Metric: `M` d [`x` | `X` | `×` | `*` P] [`-` tolerance class], decimal
//! point or comma, spaces anywhere between tokens. `M10x1.5` is the coarse
//! pitch and stays series `Coarse` (normalised `M10`).
//!
//! Unified: [`#`] size `-` n [series] [[`-`] class]. Size is a fraction
//! (`1/2`), a mixed number (`1-1/4`), a decimal (`0.500`), a number size
//! (`#10`, or `10` without the hash for #2–#12) or a whole inch (`1`, `2`).
//! Series is `UNC`, `UNF` or `UN` (also the rounded-root `UNRC`, `UNRF`,
//! `UNR`); without a series the UNC, then UNF, then 8-UN pitch is matched.
//! The class of fit (`2A`, `3B`, ...) and a metric tolerance class (`6g`)
//! are accepted and ignored: they set tolerances, not the basic geometry
//! the torque formulas use.
//!
//! The metric reader is here; the Unified one is in `unified`.

use super::table::{MetricSize, UnifiedSize, METRIC, SIZE_TOLERANCE, UNIFIED};
use super::{
    metric_designation, metric_geometry, unified_designation, unified_geometry, ThreadGeometry,
    ThreadSeries,
};
use crate::engine::EngineError;

mod unified;

use unified::unified;

const FIELD: &str = "thread";
const MAX_LEN: usize = 64;

struct Cursor<'a> {
    b: &'a [u8],
    i: usize,
}

impl<'a> Cursor<'a> {
    fn skip_ws(&mut self) {
        while self.i < self.b.len() && self.b[self.i].is_ascii_whitespace() {
            self.i += 1;
        }
    }
    fn peek(&self) -> Option<u8> {
        self.b.get(self.i).copied()
    }
    fn eat(&mut self, c: u8) -> bool {
        if self.peek() == Some(c) {
            self.i += 1;
            true
        } else {
            false
        }
    }
    fn at_end(&self) -> bool {
        self.i >= self.b.len()
    }
    /// Unsigned integer of at most 9 digits.
    fn integer(&mut self) -> Option<u32> {
        let start = self.i;
        let mut v: u32 = 0;
        while let Some(c) = self.peek().filter(u8::is_ascii_digit) {
            if self.i - start >= 9 {
                return None;
            }
            v = v * 10 + u32::from(c - b'0');
            self.i += 1;
        }
        (self.i > start).then_some(v)
    }
    /// Decimal number with `.` (or `,` when allowed) as separator.
    fn decimal(&mut self, allow_comma: bool) -> Option<(f64, bool)> {
        let whole = self.integer();
        let sep = self.peek();
        let has_sep = sep == Some(b'.') || (allow_comma && sep == Some(b','));
        if !has_sep {
            return whole.map(|w| (f64::from(w), false));
        }
        let save = self.i;
        self.i += 1;
        let start = self.i;
        let frac = self.integer();
        match frac {
            Some(f) => {
                let digits = (self.i - start) as i32;
                let w = f64::from(whole.unwrap_or(0));
                Some((w + f64::from(f) / 10f64.powi(digits), true))
            }
            None => {
                self.i = save;
                whole.map(|w| (f64::from(w), false))
            }
        }
    }
    /// Letters and digits up to the next separator, lower-cased into `buf`.
    fn word<'b>(&mut self, buf: &'b mut [u8; 8]) -> Option<&'b [u8]> {
        let start = self.i;
        while let Some(c) = self.peek().filter(u8::is_ascii_alphanumeric) {
            if self.i - start >= buf.len() {
                return None;
            }
            buf[self.i - start] = c.to_ascii_lowercase();
            self.i += 1;
        }
        Some(&buf[..self.i - start])
    }
}

fn malformed(reason: &str) -> EngineError {
    EngineError::malformed(FIELD, reason)
}

/// Parses a thread designation into tabulated geometry.
///
/// Errors (field `thread`): Malformed when the text cannot be read; Unknown
/// for an unrecognised series suffix; Invalid for a size/pitch pair that is
/// not tabulated, with the nearest standard designations as suggestions.
pub fn parse_designation(text: &str) -> Result<ThreadGeometry, EngineError> {
    if text.len() > MAX_LEN {
        return Err(malformed("thread designation is longer than 64 characters"));
    }
    let mut c = Cursor {
        b: text.as_bytes(),
        i: 0,
    };
    c.skip_ws();
    match c.peek() {
        None => Err(malformed("thread designation is empty")),
        Some(b'M' | b'm') => {
            c.i += 1;
            metric(&mut c)
        }
        Some(b'#' | b'.' | b'0'..=b'9') => unified(&mut c),
        Some(_) => Err(malformed(
            "expected a metric designation such as M10 or M10x1.25, or a Unified one such as 1/2-13 UNC",
        )),
    }
}

fn metric(c: &mut Cursor) -> Result<ThreadGeometry, EngineError> {
    c.skip_ws();
    let d = match c.decimal(true) {
        Some((d, _)) if d > 0.0 => d,
        _ => {
            return Err(malformed(
                "expected the nominal diameter after 'M', e.g. M10",
            ))
        }
    };
    c.skip_ws();
    let mut pitch = None;
    let times = c.peek() == Some(0xC3) && c.b.get(c.i + 1) == Some(&0x97);
    if times || matches!(c.peek(), Some(b'x' | b'X' | b'*')) {
        c.i += if times { 2 } else { 1 };
        c.skip_ws();
        match c.decimal(true) {
            Some((p, _)) if p > 0.0 => pitch = Some(p),
            _ => return Err(malformed("expected the pitch after 'x', e.g. M10x1.25")),
        }
        c.skip_ws();
    }
    if c.eat(b'-') {
        // Tolerance class such as 6g or 6H: accepted and ignored.
        c.skip_ws();
        let mut buf = [0u8; 8];
        match c.word(&mut buf) {
            Some(w) if !w.is_empty() => {}
            _ => return Err(malformed("expected a tolerance class such as 6g after '-'")),
        }
        c.skip_ws();
    }
    if !c.at_end() {
        return Err(malformed("unexpected text after the metric designation"));
    }
    let Some(size) = METRIC.iter().find(|s| (s.d - d).abs() < SIZE_TOLERANCE) else {
        return Err(nearest_metric_sizes(d));
    };
    match pitch {
        None => Ok(coarse(size)),
        Some(p) if (p - size.coarse).abs() < SIZE_TOLERANCE => Ok(coarse(size)),
        Some(p) => match size
            .fine
            .iter()
            .find(|(fp, _)| (fp - p).abs() < SIZE_TOLERANCE)
        {
            Some((fp, text)) => Ok(metric_geometry(
                metric_designation(size, Some(text)),
                ThreadSeries::Fine,
                size.d,
                *fp,
            )),
            None => Err(EngineError::Invalid {
                field: FIELD.into(),
                reason: format!("M{} has no ISO 261 pitch {p} mm", size.d_text),
                suggestions: metric_pitches(size),
            }),
        },
    }
}

fn coarse(size: &MetricSize) -> ThreadGeometry {
    metric_geometry(
        metric_designation(size, None),
        ThreadSeries::Coarse,
        size.d,
        size.coarse,
    )
}

fn metric_pitches(size: &MetricSize) -> Vec<String> {
    std::iter::once(metric_designation(size, None))
        .chain(
            size.fine
                .iter()
                .map(|(_, t)| metric_designation(size, Some(t))),
        )
        .collect()
}

fn nearest_metric_sizes(d: f64) -> EngineError {
    let mut sizes: Vec<&MetricSize> = METRIC.iter().collect();
    sizes.sort_by(|a, b| (a.d - d).abs().total_cmp(&(b.d - d).abs()));
    EngineError::Invalid {
        field: FIELD.into(),
        reason: format!("M{d} is not an ISO 261 size tabulated here (M1.6 to M64)"),
        suggestions: sizes
            .iter()
            .take(2)
            .map(|s| metric_designation(s, None))
            .collect(),
    }
}
