"""Analysis of one network under an operating point: stress, derating, tolerance, temperature."""
