//! The cautions a spec or setpoint response carries: the engine's set for
//! that spec (`Spec::cautions`), the same on both answers. There are only a
//! few possible sets, so the JSON of each is written once per process and
//! copied into each response instead of being escaped again each time.

use std::sync::LazyLock;

use serde::{Serialize, Serializer};
use serde_json::value::RawValue;

use crate::engine::cautions::CautionSet;

/// The cautions of one response.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Cautions(CautionSet);

/// The sets a spec can carry, with their JSON, written once.
static RENDERED: LazyLock<Vec<(CautionSet, Option<Box<RawValue>>)>> = LazyLock::new(|| {
    let mut sets = Vec::with_capacity(4);
    for angle in [false, true] {
        for plastic in [false, true] {
            let set = CautionSet::for_spec(angle, plastic);
            sets.push((set, render(set)));
        }
    }
    sets
});

fn render(set: CautionSet) -> Option<Box<RawValue>> {
    let texts: Vec<&str> = set.texts().collect();
    let json = serde_json::to_string(&texts).ok()?;
    RawValue::from_string(json).ok()
}

impl Cautions {
    /// The cautions of a spec.
    pub fn of(set: CautionSet) -> Self {
        Self(set)
    }

    /// The texts, in order.
    pub fn texts(self) -> impl Iterator<Item = &'static str> {
        self.0.texts()
    }

    /// The JSON written once, when this is one of the sets a spec can have.
    fn rendered(self) -> Option<&'static RawValue> {
        RENDERED
            .iter()
            .find(|(c, _)| *c == self.0)
            .and_then(|(_, raw)| raw.as_deref())
    }
}

impl Serialize for Cautions {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        match self.rendered() {
            Some(raw) => raw.serialize(s),
            None => s.collect_seq(self.texts()),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::engine::cautions::Caution;

    #[test]
    fn written_as_the_plain_list_would_be() {
        for (angle, plastic) in [(false, false), (true, false), (true, true), (false, true)] {
            let which = Cautions::of(CautionSet::for_spec(angle, plastic));
            assert!(which.rendered().is_some(), "standard set written once");
            let raw = serde_json::to_string(&which).unwrap();
            let plain = serde_json::to_string(&which.texts().collect::<Vec<_>>()).unwrap();
            assert_eq!(raw, plain);
            // Also inside another value (the raw path is taken there too).
            let nested = serde_json::to_value(serde_json::json!({ "c": which })).unwrap();
            assert_eq!(
                nested["c"].as_array().map(Vec::len),
                Some(which.texts().count())
            );
        }
    }

    #[test]
    fn the_plastic_range_set_ends_with_no_re_use() {
        let all = Cautions::of(
            CautionSet::base()
                .with(Caution::NoReuse)
                .with(Caution::ElasticModel),
        );
        let json: Vec<String> =
            serde_json::from_str(&serde_json::to_string(&all).unwrap()).unwrap();
        assert_eq!(json.len(), 6);
        assert!(json[0].contains("ISO 16047"));
        assert!(json[5].contains("re-used"));
    }
}
