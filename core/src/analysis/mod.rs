//! Statistics beyond the rules: paleocurrents, facies transitions, body statistics, curves.
