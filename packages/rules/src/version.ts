// Stored with every evaluation the API records. Bump it whenever a rule, a value or a clause changes, so
// an auditor can tell which rules judged a coupon.
export const RULES_VERSION = '2.1.0';
