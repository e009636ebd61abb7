//! Number formatting shared by the text reports.

/// A frequency with a k suffix above 1 kHz: `950 Hz`, `1.25 kHz`.
pub fn fmt_hz(hz: f64) -> String {
    if hz >= 1000.0 {
        format!("{:.3} kHz", hz / 1000.0)
    } else if hz >= 10.0 {
        format!("{hz:.1} Hz")
    } else {
        format!("{hz:.3} Hz")
    }
}

/// A level in dB with an explicit sign; below −200 dB (an exact zero in float
/// arithmetic) it reads `< -200 dB`.
pub fn fmt_db(db: f64) -> String {
    if db < -200.0 {
        "< -200 dB".to_string()
    } else {
        format!("{db:+.2} dB")
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn frequencies_switch_to_kilohertz() {
        assert_eq!(fmt_hz(950.0), "950.0 Hz");
        assert_eq!(fmt_hz(1250.0), "1.250 kHz");
        assert_eq!(fmt_db(-3.0103), "-3.01 dB");
    }
}
