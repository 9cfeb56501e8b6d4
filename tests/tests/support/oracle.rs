//! Running a Python reference computation (numpy, scipy, astropy) from a test, and seeded
//! random cases for it.

use std::process::Command;

/// Run a Python snippet with arguments and parse its JSON output. The oracle is required: a
/// missing python3 or library (`needs`, e.g. "numpy") fails the test with a clear message.
pub fn python_json(script: &str, args: &[&str], needs: &str) -> serde_json::Value {
    let out = Command::new("python3").arg("-c").arg(script).args(args).output().unwrap_or_else(|e| {
        panic!("python3 is required for this reference check (pip install -r scripts/requirements-test.txt): {e}")
    });
    assert!(
        out.status.success(),
        "the Python reference check failed (is {needs} installed? pip install -r scripts/requirements-test.txt):\n{}",
        String::from_utf8_lossy(&out.stderr)
    );
    serde_json::from_slice(&out.stdout).unwrap_or_else(|e| panic!("oracle output is not JSON ({e})"))
}

/// SplitMix64: a small seeded generator, so the cases are random but repeatable.
pub struct SplitMix(pub u64);

impl SplitMix {
    /// The next number in [0, 1).
    pub fn next_f64(&mut self) -> f64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        ((z ^ (z >> 31)) >> 11) as f64 / (1u64 << 53) as f64
    }

    /// The next number in [lo, hi).
    pub fn range(&mut self, lo: f64, hi: f64) -> f64 {
        lo + (hi - lo) * self.next_f64()
    }
}
