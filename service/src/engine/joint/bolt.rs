//! Bolt geometry: a bolt given by its length, thread length and optional
//! reduced shank sections, or by a product standard and nominal length (the
//! thread length b then from that standard's b column), and the part of it
//! that lies inside the clamp length — the shank sections and free loaded
//! thread that `angle::resilience` turns into δ_S (VDI 2230 Part 1 §5.1.1).
//!
//! Thread lengths b of the product standards (all recalled from memory, not
//! checked against the standards here):
//! - ISO 4014:2011 Table 1, reference b: 2d + 6 mm for l ≤ 125 mm,
//!   2d + 12 mm for 125 < l ≤ 200 mm, 2d + 25 mm for l > 200 mm;
//! - ISO 4017:2011: threaded up to the head (the runout under the head, at
//!   most about 3P, is counted as thread here);
//! - ISO 4762:2004 Table 1, reference b: 2d + 12 mm; a screw shorter than
//!   that is taken as threaded up to the head;
//! - ASME B18.2.1 hex cap screw, thread length L_T: 2D + 1/4 in for
//!   L ≤ 6 in, 2D + 1/2 in for L > 6 in; a shorter screw is taken as threaded
//!   up to the head.

use uom::si::f64::Length;
use uom::si::length::{inch, meter, millimeter};

use crate::engine::angle::ShankSection;
use crate::engine::quantity::positive;
use crate::engine::thread::ThreadGeometry;
use crate::engine::EngineError;

/// Most reduced shank sections a bolt may list (a bound on the work per
/// request; real waisted bolts have two or three).
pub const MAX_SHANK_SECTIONS: usize = 8;

/// A product standard whose thread-length column gives b.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum BoltStandard {
    /// ISO 4014 hexagon head bolt, partly threaded.
    Iso4014,
    /// ISO 4017 hexagon head screw, threaded up to the head.
    Iso4017,
    /// ISO 4762 hexagon socket head cap screw.
    Iso4762,
    /// ASME B18.2.1 hex cap screw (inch).
    AsmeB1821HexCapScrew,
}

impl BoltStandard {
    /// Every standard, in the order the API lists them.
    pub const ALL: [BoltStandard; 4] = [
        Self::Iso4014,
        Self::Iso4017,
        Self::Iso4762,
        Self::AsmeB1821HexCapScrew,
    ];

    /// API id.
    pub fn id(self) -> &'static str {
        match self {
            Self::Iso4014 => "iso-4014",
            Self::Iso4017 => "iso-4017",
            Self::Iso4762 => "iso-4762",
            Self::AsmeB1821HexCapScrew => "asme-b18.2.1",
        }
    }

    /// Socket head (l_SK = 0.4·d in δ_S) rather than a hexagon head (0.5·d).
    pub fn socket_head(self) -> bool {
        self == Self::Iso4762
    }

    fn inch(self) -> bool {
        self == Self::AsmeB1821HexCapScrew
    }
}

impl std::str::FromStr for BoltStandard {
    type Err = EngineError;
    fn from_str(s: &str) -> Result<Self, Self::Err> {
        let k = s.trim().to_ascii_lowercase().replace([' ', '_'], "-");
        // The ASME standard also covers other products; its hex cap screw is
        // the one meant, and may be named in full.
        let k = k.strip_suffix("-hex-cap-screw").unwrap_or(&k).to_string();
        Self::ALL
            .into_iter()
            .find(|b| b.id() == k || b.id().replace('-', "") == k.replace('-', ""))
            .ok_or_else(|| EngineError::Unknown {
                field: "bolt.standard".into(),
                kind: "bolt standard",
                given: s.chars().take(60).collect(),
                suggestions: Self::ALL.iter().map(|b| b.id().to_string()).collect(),
            })
    }
}

/// How the request describes the bolt.
#[derive(Debug, Clone, PartialEq)]
pub enum BoltInput {
    /// Lengths given: `length` under the head, `thread_length` b, and reduced
    /// shank sections from under the head (the rest of the unthreaded part is
    /// a plain shank of the nominal diameter).
    Explicit {
        length: Length,
        thread_length: Length,
        shank_sections: Vec<ShankSection>,
        socket_head: bool,
    },
    /// A standard product of nominal length l.
    Standard {
        standard: BoltStandard,
        length: Length,
    },
}

/// A validated bolt: everything between head and thread end.
#[derive(Debug, Clone, PartialEq)]
pub struct Bolt {
    /// Length under the head l.
    pub length: Length,
    /// Thread length b (equal to `length` when threaded up to the head).
    pub thread_length: Length,
    /// The unthreaded part from under the head, section by section (empty
    /// when threaded up to the head).
    pub shank: Vec<ShankSection>,
    /// Socket head (l_SK = 0.4·d) rather than hexagon head (0.5·d).
    pub socket_head: bool,
}

/// The bolt inside the clamp length, as `angle::resilience` takes it.
#[derive(Debug, Clone, PartialEq)]
pub struct ClampedBolt {
    /// Shank sections inside the clamp length, from under the head.
    pub shank_sections: Vec<ShankSection>,
    /// Free loaded thread l_Gew = l_K − Σl_i.
    pub free_thread_length: Length,
    pub socket_head: bool,
}

fn mm(v: f64) -> Length {
    Length::new::<millimeter>(v)
}

/// Thread length b of a standard product (see the module comment for the
/// sources). Refuses a length for which the standard has no partly threaded
/// product (ISO 4014 at or below b).
pub fn standard_thread_length(
    standard: BoltStandard,
    thread: &ThreadGeometry,
    length: Length,
) -> Result<Length, EngineError> {
    let l = positive(length.value, "bolt.length")?;
    if standard.inch() != thread.is_inch() {
        return Err(EngineError::invalid(
            "bolt.standard",
            format!(
                "{} is for {} threads, the thread given is {}",
                standard.id(),
                if standard.inch() { "inch" } else { "metric" },
                thread.designation
            ),
        ));
    }
    let d = thread.nominal_diameter.value;
    let b = match standard {
        BoltStandard::Iso4014 => {
            let lmm = l * 1e3;
            let extra = if lmm <= 125.0 {
                6.0
            } else if lmm <= 200.0 {
                12.0
            } else {
                25.0
            };
            let b = 2.0 * d + mm(extra).value;
            if b >= l {
                return Err(EngineError::invalid(
                    "bolt.length",
                    format!(
                        "an ISO 4014 bolt of {:.1} mm would have no plain shank (b = {:.1} mm); \
                         bolts this short are ISO 4017, threaded up to the head",
                        l * 1e3,
                        b * 1e3
                    ),
                ));
            }
            b
        }
        BoltStandard::Iso4017 => l,
        BoltStandard::Iso4762 => (2.0 * d + mm(12.0).value).min(l),
        BoltStandard::AsmeB1821HexCapScrew => {
            let six = Length::new::<inch>(6.0).value;
            let extra = if l <= six { 0.25 } else { 0.5 };
            (2.0 * d + Length::new::<inch>(extra).value).min(l)
        }
    };
    Ok(Length::new::<meter>(b))
}

/// Validate a bolt description against its thread.
pub fn bolt(thread: &ThreadGeometry, input: &BoltInput) -> Result<Bolt, EngineError> {
    let d = thread.nominal_diameter.value;
    match input {
        BoltInput::Standard { standard, length } => {
            let b = standard_thread_length(*standard, thread, *length)?;
            let plain = length.value - b.value;
            Ok(Bolt {
                length: *length,
                thread_length: b,
                shank: if plain > 0.0 {
                    vec![ShankSection {
                        length: Length::new::<meter>(plain),
                        diameter: thread.nominal_diameter,
                    }]
                } else {
                    Vec::new()
                },
                socket_head: standard.socket_head(),
            })
        }
        BoltInput::Explicit {
            length,
            thread_length,
            shank_sections,
            socket_head,
        } => {
            let l = positive(length.value, "bolt.length")?;
            let b = positive(thread_length.value, "bolt.thread_length")?;
            if b > l {
                return Err(EngineError::invalid(
                    "bolt.thread_length",
                    format!(
                        "thread length {:.2} mm is longer than the bolt ({:.2} mm)",
                        b * 1e3,
                        l * 1e3
                    ),
                ));
            }
            if shank_sections.len() > MAX_SHANK_SECTIONS {
                return Err(EngineError::invalid(
                    "bolt.shank_sections",
                    format!(
                        "{} shank sections given, at most {MAX_SHANK_SECTIONS} are accepted",
                        shank_sections.len()
                    ),
                ));
            }
            let mut shank = Vec::with_capacity(shank_sections.len() + 1);
            let mut total = 0.0;
            for (i, s) in shank_sections.iter().enumerate() {
                let li = positive(s.length.value, &format!("bolt.shank_sections[{i}].length"))?;
                let di = positive(
                    s.diameter.value,
                    &format!("bolt.shank_sections[{i}].diameter"),
                )?;
                if di > d * (1.0 + 1e-9) {
                    return Err(EngineError::invalid(
                        format!("bolt.shank_sections[{i}].diameter"),
                        format!(
                            "a shank section of {:.2} mm cannot be thicker than the nominal \
                             diameter {:.2} mm",
                            di * 1e3,
                            d * 1e3
                        ),
                    ));
                }
                total += li;
                shank.push(*s);
            }
            let plain = l - b;
            if total > plain * (1.0 + 1e-9) {
                return Err(EngineError::invalid(
                    "bolt.shank_sections",
                    format!(
                        "shank sections total {:.2} mm, longer than the unthreaded part of the \
                         bolt ({:.2} mm = length − thread length)",
                        total * 1e3,
                        plain * 1e3
                    ),
                ));
            }
            let rest = plain - total;
            if rest > plain * 1e-9 {
                shank.push(ShankSection {
                    length: Length::new::<meter>(rest),
                    diameter: thread.nominal_diameter,
                });
            }
            Ok(Bolt {
                length: *length,
                thread_length: *thread_length,
                shank,
                socket_head: *socket_head,
            })
        }
    }
}

/// The bolt inside the clamp length l_K: the shank sections from under the
/// head up to l_K and the free loaded thread behind them (VDI 2230 Part 1
/// §5.1.1: l_Gew = l_K − Σl_i). `engagement` is the thread length the nut
/// or tapped hole needs beyond l_K (its field is named in the error).
pub fn in_clamp_length(
    bolt: &Bolt,
    clamp_length: Length,
    engagement: Length,
    engagement_field: &str,
) -> Result<ClampedBolt, EngineError> {
    let lk = positive(clamp_length.value, "joint.clamp_length")?;
    let le = positive(engagement.value, engagement_field)?;
    let l = bolt.length.value;
    if l < (lk + le) * (1.0 - 1e-12) {
        return Err(EngineError::invalid(
            "bolt.length",
            format!(
                "a bolt of {:.2} mm is too short for the clamp length {:.2} mm plus {:.2} mm of \
                 thread engagement",
                l * 1e3,
                lk * 1e3,
                le * 1e3
            ),
        ));
    }
    let plain = l - bolt.thread_length.value;
    if plain >= lk {
        return Err(EngineError::invalid(
            "bolt.thread_length",
            format!(
                "the thread starts {:.2} mm under the head, at or beyond the clamp length \
                 {:.2} mm: the nut or tapped hole would run onto the shank and not clamp",
                plain * 1e3,
                lk * 1e3
            ),
        ));
    }
    let mut sections = Vec::with_capacity(bolt.shank.len());
    let mut used = 0.0;
    for s in &bolt.shank {
        let take = s.length.value.min(lk - used);
        if take <= 0.0 {
            break;
        }
        sections.push(ShankSection {
            length: Length::new::<meter>(take),
            diameter: s.diameter,
        });
        used += take;
    }
    Ok(ClampedBolt {
        shank_sections: sections,
        free_thread_length: Length::new::<meter>(lk - used),
        socket_head: bolt.socket_head,
    })
}

#[cfg(test)]
mod tests;
