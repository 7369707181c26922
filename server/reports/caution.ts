/**
 * The safety caution every margin report carries (product.md, capability 8), in the same
 * words as the link page's caution.
 */
export const SAFETY_CAUTION =
  'Isolation protects people from hazardous voltage. Bitslack checks signal timing only: insulation ratings, creepage, clearance and safety approvals follow the applicable standards, local codes and licensed practice, and bench verification of every link is still required.'
