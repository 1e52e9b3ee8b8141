import type { ReactNode, TableHTMLAttributes, TdHTMLAttributes, ThHTMLAttributes } from "react";

/** A plain, accessible data table; scrolls sideways on narrow screens instead of squashing. */
export function Table({ caption, children, className = "", ...rest }: TableHTMLAttributes<HTMLTableElement> & { caption?: ReactNode }) {
  return (
    <div className="card overflow-x-auto">
      <table className={`w-full border-collapse text-left text-sm ${className}`} {...rest}>
        {caption ? <caption className="px-4 pt-3 text-left text-sm text-ink-soft">{caption}</caption> : null}
        {children}
      </table>
    </div>
  );
}

export function Th({ className = "", ...rest }: ThHTMLAttributes<HTMLTableCellElement>) {
  return <th scope="col" className={`border-b border-line bg-sand px-4 py-2.5 font-semibold text-ink ${className}`} {...rest} />;
}

export function Td({ className = "", ...rest }: TdHTMLAttributes<HTMLTableCellElement>) {
  return <td className={`border-b border-line/70 px-4 py-2.5 align-top text-ink ${className}`} {...rest} />;
}
