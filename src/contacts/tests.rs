//! Constructed profiles with known answers for the contact audit.

use super::*;
