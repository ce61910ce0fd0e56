//! The caution every output carries, in its own leaf module so that every layer can use it
//! without importing the crate root.

/// The caution every summary, report and listing of this crate carries.
pub const CAUTION: &str = "Results assist a licensed engineer and do not replace one: final \
design belongs to a licensed engineer under the local building code, and the adopted edition \
of each standard governs.";
