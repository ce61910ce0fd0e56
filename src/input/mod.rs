//! Reading model files (skeleton).
