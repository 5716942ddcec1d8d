//! Webhook signing per the Standard Webhooks convention: a secret
//! `whsec_` + base64 of 24 random bytes per subscription; the signed
//! content `{webhook-id}.{webhook-timestamp}.{body}`; the signature
//! `v1,` + base64 of HMAC-SHA256 (RFC 2104, with SHA-256 of FIPS 180-4)
//! keyed with the secret's decoded bytes.

use base64::engine::general_purpose::STANDARD;
use base64::Engine;
use hmac::{Hmac, Mac};
use sha2::Sha256;

/// The prefix of a signing secret.
pub const SECRET_PREFIX: &str = "whsec_";

/// Random bytes in a new secret (192 bits).
const SECRET_BYTES: usize = 24;

/// A new signing secret: `whsec_` + base64 of 24 random bytes.
pub fn new_secret() -> String {
    let bytes: [u8; SECRET_BYTES] = rand::random();
    format!("{SECRET_PREFIX}{}", STANDARD.encode(bytes))
}

/// The key a secret stands for: its base64 after `whsec_` decoded;
/// `None` when it is not such a secret.
fn key(secret: &str) -> Option<Vec<u8>> {
    let encoded = secret.strip_prefix(SECRET_PREFIX)?;
    STANDARD.decode(encoded).ok().filter(|k| !k.is_empty())
}

/// The `webhook-signature` header value for one message: `v1,` + base64
/// HMAC-SHA256 over `id.timestamp.body`. `None` for a malformed secret.
pub fn sign(secret: &str, id: &str, timestamp: i64, body: &[u8]) -> Option<String> {
    let key = key(secret)?;
    let mut mac = Hmac::<Sha256>::new_from_slice(&key).ok()?;
    mac.update(id.as_bytes());
    mac.update(b".");
    mac.update(timestamp.to_string().as_bytes());
    mac.update(b".");
    mac.update(body);
    Some(format!(
        "v1,{}",
        STANDARD.encode(mac.finalize().into_bytes())
    ))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn hmac_sha256_matches_the_rfc_4231_vector() {
        // RFC 4231, section 4.3 (test case 2): key "Jefe", data "what do
        // ya want for nothing?"; the expected digest as the RFC prints it
        // (checked here with Python's standard hmac module as well).
        let mut mac = Hmac::<Sha256>::new_from_slice(b"Jefe").unwrap();
        mac.update(b"what do ya want for nothing?");
        assert_eq!(
            hex::encode(mac.finalize().into_bytes()),
            "5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843"
        );
    }

    #[test]
    fn a_message_is_signed_over_id_timestamp_and_body() {
        // The expected value was computed outside this crate, with Python 3's
        // standard library: key = bytes(range(1, 25)); secret = "whsec_" +
        // base64.b64encode(key); sig = base64.b64encode(hmac.new(key,
        // b"0b1c.1796292000." + body, hashlib.sha256).digest()).
        let secret = "whsec_AQIDBAUGBwgJCgsMDQ4PEBESExQVFhcY";
        let body = br#"{"specversion":"1.0","id":"0b1c","type":"joint.released"}"#;
        assert_eq!(
            sign(secret, "0b1c", 1_796_292_000, body).unwrap(),
            "v1,Dg8tuymu9fb0fK6XOBEjMTh0zoy0Nezw9eBtf4omugE="
        );
        // any change to id, timestamp or body changes the signature
        let other = sign(secret, "0b1d", 1_796_292_000, body).unwrap();
        assert_ne!(other, sign(secret, "0b1c", 1_796_292_000, body).unwrap());
        assert_ne!(
            sign(secret, "0b1c", 1_796_292_001, body).unwrap(),
            sign(secret, "0b1c", 1_796_292_000, body).unwrap()
        );
    }

    #[test]
    fn a_new_secret_has_the_prefix_and_24_random_bytes() {
        let a = new_secret();
        let b = new_secret();
        assert!(a.starts_with(SECRET_PREFIX));
        assert_eq!(key(&a).unwrap().len(), SECRET_BYTES);
        assert_ne!(a, b);
    }

    #[test]
    fn a_malformed_secret_signs_nothing() {
        assert_eq!(sign("no-prefix", "i", 1, b""), None);
        assert_eq!(sign("whsec_***", "i", 1, b""), None);
        assert_eq!(sign("whsec_", "i", 1, b""), None);
    }
}
