//! Base64 with the URL- and filename-safe alphabet, without padding
//! (RFC 4648 §5). Small enough to keep here rather than add a crate.

const ALPHABET: &[u8; 64] =
    b"ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_";

/// Encodes bytes, no `=` padding.
pub fn encode(bytes: &[u8]) -> String {
    let mut out = String::with_capacity(bytes.len().div_ceil(3) * 4);
    for chunk in bytes.chunks(3) {
        let b = [
            chunk[0],
            chunk.get(1).copied().unwrap_or(0),
            chunk.get(2).copied().unwrap_or(0),
        ];
        let n = (u32::from(b[0]) << 16) | (u32::from(b[1]) << 8) | u32::from(b[2]);
        let chars = chunk.len() + 1;
        for i in 0..chars {
            let idx = (n >> (18 - 6 * i)) & 63;
            out.push(ALPHABET[idx as usize] as char);
        }
    }
    out
}

fn value(c: u8) -> Option<u32> {
    Some(match c {
        b'A'..=b'Z' => c - b'A',
        b'a'..=b'z' => c - b'a' + 26,
        b'0'..=b'9' => c - b'0' + 52,
        b'-' => 62,
        b'_' => 63,
        _ => return None,
    } as u32)
}

/// Decodes text written by [`encode`]; trailing `=` padding is accepted.
/// `None` for any other character, an impossible length, or non-zero
/// leftover bits (so each byte string has exactly one text).
pub fn decode(text: &str) -> Option<Vec<u8>> {
    let t = text.trim_end_matches('=').as_bytes();
    if t.len() % 4 == 1 {
        return None;
    }
    let mut out = Vec::with_capacity(t.len() / 4 * 3 + 2);
    for chunk in t.chunks(4) {
        let mut n = 0u32;
        for (i, &c) in chunk.iter().enumerate() {
            n |= value(c)? << (18 - 6 * i);
        }
        let bytes = chunk.len() - 1;
        let leftover = match bytes {
            1 => n & 0xFFFF,
            2 => n & 0xFF,
            _ => 0,
        };
        if leftover != 0 {
            return None;
        }
        for i in 0..bytes {
            out.push((n >> (16 - 8 * i)) as u8);
        }
    }
    Some(out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    /// Test vectors of RFC 4648 §10 (padding removed, as §5 allows).
    #[test]
    fn rfc4648_vectors() {
        let table = [
            ("", ""),
            ("f", "Zg"),
            ("fo", "Zm8"),
            ("foo", "Zm9v"),
            ("foob", "Zm9vYg"),
            ("fooba", "Zm9vYmE"),
            ("foobar", "Zm9vYmFy"),
        ];
        for (plain, coded) in table {
            assert_eq!(encode(plain.as_bytes()), coded);
            assert_eq!(decode(coded).as_deref(), Some(plain.as_bytes()));
        }
        assert_eq!(decode("Zg==").as_deref(), Some(&b"f"[..]));
    }

    #[test]
    fn url_safe_alphabet() {
        // 0xfb 0xff → "-_8" in base64url, "+/8" in plain base64.
        assert_eq!(encode(&[0xfb, 0xff]), "-_8");
        assert_eq!(decode("+/8"), None);
        assert_eq!(decode("Z"), None);
        assert_eq!(decode("Zh"), None, "leftover bits must be zero");
        assert_eq!(decode("Zm9v YmFy"), None);
    }

    proptest! {
        #[test]
        fn round_trip(bytes in proptest::collection::vec(any::<u8>(), 0..200)) {
            prop_assert_eq!(decode(&encode(&bytes)), Some(bytes));
        }

        #[test]
        fn decode_never_panics(s in ".{0,100}") {
            let _ = decode(&s);
        }
    }
}
