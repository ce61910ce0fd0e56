//! Combination tables as data (skeleton).
