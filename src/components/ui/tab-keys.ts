/**
 * Which tab a key press moves to in a tab strip (WAI-ARIA Authoring Practices, "Tabs"):
 * Left/Right arrows step and wrap around, Home and End go to the ends. Any other key: null.
 */
export function tabAfterKey(key: string, index: number, count: number): number | null {
  if (count <= 0) return null;
  switch (key) {
    case 'ArrowRight':
      return (index + 1) % count;
    case 'ArrowLeft':
      return (index - 1 + count) % count;
    case 'Home':
      return 0;
    case 'End':
      return count - 1;
    default:
      return null;
  }
}
