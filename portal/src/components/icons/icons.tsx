import type { ReactNode, SVGProps } from "react";

// Pendula's own line icons: 20×20 grid, 1.75 stroke, round caps. Decorative by default
// (aria-hidden); pass a `title` when an icon carries meaning on its own.
export type IconProps = SVGProps<SVGSVGElement> & { title?: string };

function Svg({ title, children, ...rest }: IconProps & { children: ReactNode }) {
  return (
    <svg
      viewBox="0 0 20 20"
      width="1.1em"
      height="1.1em"
      fill="none"
      stroke="currentColor"
      strokeWidth={1.75}
      strokeLinecap="round"
      strokeLinejoin="round"
      aria-hidden={title ? undefined : true}
      role={title ? "img" : undefined}
      focusable="false"
      {...rest}
    >
      {title ? <title>{title}</title> : null}
      {children}
    </svg>
  );
}

/** The Pendula mark: a bob swinging from a pivot over a ground line. */
export const IconPendula = (p: IconProps) => (
  <Svg {...p}>
    <circle cx="10" cy="3.5" r="1.2" fill="currentColor" stroke="none" />
    <path d="M10 3.5l2.6 8.3" />
    <circle cx="13.2" cy="13.6" r="2.6" fill="currentColor" stroke="none" />
    <path d="M3.5 17.5h13" />
  </Svg>
);
export const IconCheck = (p: IconProps) => (
  <Svg {...p}>
    <path d="M4 10.5l3.8 3.7L16 6" />
  </Svg>
);
export const IconAlert = (p: IconProps) => (
  <Svg {...p}>
    <path d="M10 2.8l7.6 13.4H2.4z" />
    <path d="M10 8v3.8" />
    <circle cx="10" cy="14" r="0.6" fill="currentColor" />
  </Svg>
);
export const IconInfo = (p: IconProps) => (
  <Svg {...p}>
    <circle cx="10" cy="10" r="7.2" />
    <path d="M10 9v4.6" />
    <circle cx="10" cy="6.4" r="0.6" fill="currentColor" />
  </Svg>
);
export const IconStop = (p: IconProps) => (
  <Svg {...p}>
    <path d="M7 2.8h6l4.2 4.2v6L13 17.2H7L2.8 13V7z" />
    <path d="M7.5 7.5l5 5M12.5 7.5l-5 5" />
  </Svg>
);
export const IconTrendUp = (p: IconProps) => (
  <Svg {...p}>
    <path d="M3 14.5l4.5-4.5 3 3L17 6.5" />
    <path d="M12.5 6.5H17V11" />
  </Svg>
);
export const IconTrendDown = (p: IconProps) => (
  <Svg {...p}>
    <path d="M3 5.5L7.5 10l3-3 6.5 6.5" />
    <path d="M12.5 13.5H17V9" />
  </Svg>
);
export const IconSteady = (p: IconProps) => (
  <Svg {...p}>
    <path d="M3 10h14" />
    <path d="M6 7l-3 3 3 3M14 7l3 3-3 3" />
  </Svg>
);
export const IconUpload = (p: IconProps) => (
  <Svg {...p}>
    <path d="M10 13V3.5M6.2 7.2L10 3.5l3.8 3.7" />
    <path d="M3.5 12.5v3.2a1 1 0 001 1h11a1 1 0 001-1v-3.2" />
  </Svg>
);
export const IconFile = (p: IconProps) => (
  <Svg {...p}>
    <path d="M5 2.8h6.5L15.5 7v10.2H5z" />
    <path d="M11.5 2.8V7h4" />
    <path d="M7.5 11.5h5M7.5 14h3.5" />
  </Svg>
);
export const IconPrint = (p: IconProps) => (
  <Svg {...p}>
    <path d="M5.5 7V3h9v4" />
    <rect x="2.8" y="7" width="14.4" height="6.5" rx="1.2" />
    <path d="M5.5 11.5h9V17h-9z" />
  </Svg>
);
export const IconSearch = (p: IconProps) => (
  <Svg {...p}>
    <circle cx="8.7" cy="8.7" r="5.2" />
    <path d="M12.6 12.6l4.4 4.4" />
  </Svg>
);
export const IconClock = (p: IconProps) => (
  <Svg {...p}>
    <circle cx="10" cy="10" r="7.2" />
    <path d="M10 5.8V10l2.8 1.8" />
  </Svg>
);
export const IconSort = (p: Omit<IconProps, "direction"> & { sortDir?: "asc" | "desc" | false }) => {
  const { sortDir: direction, ...rest } = p;
  return (
    <Svg {...rest}>
      <path d="M6.5 8L10 4.5 13.5 8" opacity={direction === "desc" ? 0.3 : 1} />
      <path d="M6.5 12L10 15.5 13.5 12" opacity={direction === "asc" ? 0.3 : 1} />
    </Svg>
  );
};
export const IconSignOut = (p: IconProps) => (
  <Svg {...p}>
    <path d="M8 3.5H4.2v13H8" />
    <path d="M12.5 6.5L16 10l-3.5 3.5M16 10H8" />
  </Svg>
);
export const IconWave = (p: IconProps) => (
  <Svg {...p}>
    <path d="M2.5 10c1.2-4 2.4-4 3.6 0s2.4 4 3.6 0 2.4-4 3.6 0 2.4 4 3.6 0" />
  </Svg>
);
