// Plain-words formatting for check details. No regular expressions and no Intl: details are built
// for every proposal, and the live readings helper rebuilds them on each keystroke.

const MINUS = '\u2212';

/** Fixed decimals, then drops trailing zeros down to minDecimals; a true minus sign, never "−0". */
function trimmed(value: number, maxDecimals: number, minDecimals: number): string {
  let text = value.toFixed(maxDecimals);
  let end = text.length;
  const keep = text.length - (maxDecimals - minDecimals);
  while (end > keep && text.charCodeAt(end - 1) === 48) end--;
  if (end > 0 && text.charCodeAt(end - 1) === 46) end--;
  text = text.slice(0, end);
  if (text.charCodeAt(0) === 45) {
    let allZero = true;
    for (let i = 1; i < text.length; i++) {
      const code = text.charCodeAt(i);
      if (code !== 48 && code !== 46) {
        allZero = false;
        break;
      }
    }
    text = allZero ? text.slice(1) : MINUS + text.slice(1);
  }
  return text;
}

/** A freezing point: 3 decimals, or 4 when the fourth is not zero, e.g. "−0.520 °C", "−0.5215 °C". */
export function celsius(value: number): string {
  return trimmed(value, 4, 3) + ' °C';
}

/** A difference or limit in m°C, from a value in °C: 1 to 3 decimals, e.g. "4.0 m°C", "5.292 m°C". */
export function milliCelsius(valueCelsius: number): string {
  return trimmed(valueCelsius * 1000, 3, 1) + ' m°C';
}

/** A storage temperature, e.g. "4.5 °C". */
export function storageCelsius(value: number): string {
  return trimmed(value, 1, 1) + ' °C';
}

export function percent(value: number): string {
  return trimmed(value, 3, 1) + ' %';
}

export function hours(value: number): string {
  return trimmed(value, 1, 0) + ' h';
}

export function probability(value: number): string {
  return trimmed(value * 100, 1, 1) + ' %';
}

/** "1 more reading", "2 more readings". */
export function count(n: number, singular: string, plural: string): string {
  return n + ' ' + (n === 1 ? singular : plural);
}
