/**
 * The safety caution on every link page and margin report (product.md, capability 8),
 * one text for the page, the printed report and the PDF.
 */
export const SAFETY_CAUTION =
  'Isolation protects people from hazardous voltage. Bitslack checks signal timing only: insulation ratings, creepage, clearance and safety approvals follow the applicable standards, local codes and licensed practice, and bench verification of every link is still required.'
