/** A cause on screen: the failure code, or words for a stop no corrective work order explains. */
export function causeLabel(cause: string): string {
  return cause === 'unknown' ? 'no cause recorded' : cause;
}
