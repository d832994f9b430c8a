//! SHA-256 digests as lowercase hex (FIPS 180-4), for the fingerprints of
//! project and readings files, hold-point check records and the hash chain
//! of the record log. A leaf module: it depends on no other part of the
//! program, so `audit`, `monitoring` and `report` can all use it.

/// SHA-256 of bytes as lowercase hex.
pub fn sha256_hex(bytes: &[u8]) -> String {
    use sha2::Digest;
    sha2::Sha256::digest(bytes).iter().map(|b| format!("{b:02x}")).collect()
}

#[cfg(test)]
mod tests {
    #[test]
    fn sha256_of_abc() {
        // FIPS 180-2 test vector: SHA-256("abc").
        assert_eq!(super::sha256_hex(b"abc"), "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    }
}
