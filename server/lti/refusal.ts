// Why a login or launch was refused. The platform's browser flow is a form post, not an API call, so a
// refusal is shown as a page (pages.ts); its reason also travels in a response header for logs and tests.
export type RefusalReason =
  | 'bad_request'
  | 'unknown_platform'
  | 'ambiguous_platform'
  | 'state_missing'
  | 'state_unknown'
  | 'state_expired'
  | 'state_cookie_missing'
  | 'state_mismatch'
  | 'nonce_replayed'
  | 'nonce_mismatch'
  | 'token_malformed'
  | 'wrong_algorithm'
  | 'unknown_key'
  | 'key_set_unavailable'
  | 'wrong_signature'
  | 'wrong_issuer'
  | 'wrong_audience'
  | 'wrong_authorised_party'
  | 'expired'
  | 'issued_at_out_of_range'
  | 'not_yet_valid'
  | 'wrong_message_type'
  | 'wrong_version'
  | 'unknown_deployment'
  | 'missing_claim'
  | 'anonymous_launch'
  | 'wrong_target'
  | 'not_allowed'

export class LtiRefusal extends Error {
  constructor(
    readonly reason: RefusalReason,
    /** For the person in front of the screen: what went wrong and what to do. */
    message: string,
    readonly status = 401,
  ) {
    super(message)
  }
}

export const refuse = (reason: RefusalReason, message: string, status?: number) =>
  new LtiRefusal(reason, message, status)

export const REFUSAL_HEADER = 'X-Slipway-Lti-Refusal'
