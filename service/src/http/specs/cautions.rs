//! The cautions a spec or setpoint response carries. They are the same
//! texts on every response, so their JSON is written once per process and
//! copied into each response instead of being escaped again each time.

use std::sync::LazyLock;

use serde::{Serialize, Serializer};
use serde_json::value::RawValue;

use crate::engine::spec::CAUTIONS;

/// How many of the engine's cautions the setpoint answer repeats (the
/// estimate-and-test caution and the precedence of drawings and codes).
const SHORT_LEN: usize = 2;

/// Which cautions a response carries.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Cautions {
    /// Every caution of `engine::spec::CAUTIONS` (specs).
    All,
    /// The first two (setpoints).
    Short,
}

static ALL_JSON: LazyLock<Option<Box<RawValue>>> = LazyLock::new(|| render(Cautions::All));
static SHORT_JSON: LazyLock<Option<Box<RawValue>>> = LazyLock::new(|| render(Cautions::Short));

fn render(which: Cautions) -> Option<Box<RawValue>> {
    let json = serde_json::to_string(which.texts()).ok()?;
    RawValue::from_string(json).ok()
}

impl Cautions {
    /// The texts, in order.
    pub fn texts(self) -> &'static [&'static str] {
        match self {
            Cautions::All => &CAUTIONS,
            Cautions::Short => &CAUTIONS[..SHORT_LEN],
        }
    }
}

impl Serialize for Cautions {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        let rendered = match self {
            Cautions::All => ALL_JSON.as_deref(),
            Cautions::Short => SHORT_JSON.as_deref(),
        };
        match rendered {
            Some(raw) => raw.serialize(s),
            None => self.texts().serialize(s),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn written_as_the_plain_list_would_be() {
        for which in [Cautions::All, Cautions::Short] {
            let raw = serde_json::to_string(&which).unwrap();
            let plain = serde_json::to_string(which.texts()).unwrap();
            assert_eq!(raw, plain);
            // Also inside another value (the raw path is taken there too).
            let nested = serde_json::to_value(serde_json::json!({ "c": which })).unwrap();
            assert_eq!(
                nested["c"].as_array().map(Vec::len),
                Some(which.texts().len())
            );
        }
        assert_eq!(Cautions::Short.texts().len(), 2);
        assert!(Cautions::All.texts()[0].contains("ISO 16047"));
    }
}
