//! Reading helpers both adapters use on client input: the nearest known
//! names to a misspelt one ([`suggest`]) and JSON Schema integers
//! ([`integral`]).

/// Known names close to `given` (Jaro-Winkler ≥ 0.8, best first, at most 3).
pub fn suggest(given: &str, known: &[String]) -> Vec<String> {
    let mut scored: Vec<(f64, &String)> = known
        .iter()
        .map(|k| (strsim::jaro_winkler(given, k), k))
        .filter(|(s, _)| *s >= 0.8)
        .collect();
    scored.sort_by(|a, b| b.0.total_cmp(&a.0));
    scored.into_iter().take(3).map(|(_, k)| k.clone()).collect()
}

/// `deserialize_with` for an optional integer: accepts what JSON Schema
/// calls an integer, so `73045.0` reads as 73045 (JSON Schema 2020-12
/// §6.1.1: a number with a zero fractional part is an integer); a
/// fraction, or a float past 2^53 (where floats skip integers), is refused. Query
/// strings give text, read the same way.
pub fn integral<'de, D: serde::Deserializer<'de>>(d: D) -> Result<Option<i64>, D::Error> {
    struct Integral;
    impl<'v> serde::de::Visitor<'v> for Integral {
        type Value = Option<i64>;
        fn expecting(&self, f: &mut std::fmt::Formatter) -> std::fmt::Result {
            f.write_str("an integer")
        }
        fn visit_i64<E: serde::de::Error>(self, v: i64) -> Result<Self::Value, E> {
            Ok(Some(v))
        }
        fn visit_u64<E: serde::de::Error>(self, v: u64) -> Result<Self::Value, E> {
            i64::try_from(v)
                .map(Some)
                .map_err(|_| E::custom(format!("{v} is larger than the largest integer accepted")))
        }
        fn visit_f64<E: serde::de::Error>(self, v: f64) -> Result<Self::Value, E> {
            // Past 2^53 a float no longer tells neighbouring integers apart.
            const LIMIT: f64 = 9_007_199_254_740_992.0;
            if v.is_finite() && v.fract() == 0.0 && (-LIMIT..LIMIT).contains(&v) {
                #[allow(clippy::cast_possible_truncation)]
                return Ok(Some(v as i64));
            }
            Err(E::custom(format!("expected an integer, got {v}")))
        }
        fn visit_str<E: serde::de::Error>(self, v: &str) -> Result<Self::Value, E> {
            let t = v.trim();
            if let Ok(i) = t.parse::<i64>() {
                return Ok(Some(i));
            }
            if !t.contains(['.', 'e', 'E']) {
                return Err(E::custom(format!("expected a 64-bit integer, got '{v}'")));
            }
            match t.parse::<f64>() {
                Ok(f) => self.visit_f64(f),
                Err(_) => Err(E::custom(format!("expected an integer, got '{v}'"))),
            }
        }
        fn visit_none<E: serde::de::Error>(self) -> Result<Self::Value, E> {
            Ok(None)
        }
        fn visit_unit<E: serde::de::Error>(self) -> Result<Self::Value, E> {
            Ok(None)
        }
        fn visit_some<D2: serde::Deserializer<'v>>(self, d: D2) -> Result<Self::Value, D2::Error> {
            d.deserialize_any(Integral)
        }
    }
    d.deserialize_option(Integral)
}
