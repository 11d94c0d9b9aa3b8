import type { SVGProps } from 'react';

/**
 * Bankwright's own icon set: 20×20 grid, 1.6 px strokes in currentColor. Decorative by default
 * (aria-hidden); pass `title` to give an icon an accessible name.
 */
type IconProps = SVGProps<SVGSVGElement> & { title?: string; size?: number };

function Icon({ title, size = 16, children, ...rest }: IconProps & { children: React.ReactNode }) {
  return (
    <svg
      width={size}
      height={size}
      viewBox="0 0 20 20"
      fill="none"
      stroke="currentColor"
      strokeWidth={1.6}
      strokeLinecap="round"
      strokeLinejoin="round"
      aria-hidden={title ? undefined : true}
      role={title ? 'img' : undefined}
      focusable="false"
      {...rest}
    >
      {title ? <title>{title}</title> : null}
      {children}
    </svg>
  );
}

/** The mark: three cells in parallel hanging from a copper busbar. */
export function LogoMark({ size = 28, ...rest }: SVGProps<SVGSVGElement> & { size?: number }) {
  return (
    <svg width={size} height={size} viewBox="0 0 32 32" aria-hidden="true" focusable="false" {...rest}>
      <rect x="1" y="1" width="30" height="30" rx="7" fill="var(--color-graphite-800)" />
      <rect x="5" y="6.5" width="22" height="3.2" rx="1.2" fill="var(--color-copper-400)" />
      <g fill="var(--color-graphite-200)">
        <rect x="6.5" y="13" width="5" height="13" rx="1.2" />
        <rect x="13.5" y="13" width="5" height="13" rx="1.2" />
        <rect x="20.5" y="13" width="5" height="13" rx="1.2" />
      </g>
      <g stroke="var(--color-copper-400)" strokeWidth="1.6">
        <path d="M9 9.7V13M16 9.7V13M23 9.7V13" />
      </g>
      <path d="M8 17h2M15 17h2M22 17h2" stroke="var(--color-graphite-700)" strokeWidth="1.4" />
    </svg>
  );
}

export const ChevronDownIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M5.5 8l4.5 4.5L14.5 8" />
  </Icon>
);
export const ChevronRightIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M8 5.5l4.5 4.5L8 14.5" />
  </Icon>
);
export const ArrowLeftIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M15.5 10h-11M9 5.5L4.5 10 9 14.5" />
  </Icon>
);
export const CheckIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M4.5 10.5l3.5 3.5 7.5-8" />
  </Icon>
);
export const PlusIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M10 4.5v11M4.5 10h11" />
  </Icon>
);
export const CloseIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M5.5 5.5l9 9M14.5 5.5l-9 9" />
  </Icon>
);
export const PencilIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M12.8 4.2l3 3L8 15H5v-3z" />
    <path d="M11 6l3 3" />
  </Icon>
);
export const TrashIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M4 6h12M8 6V4.5h4V6M5.5 6l.8 10h7.4l.8-10" />
    <path d="M8.5 9v4.5M11.5 9v4.5" />
  </Icon>
);
export const RefreshIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M15.5 9.5A5.5 5.5 0 1 1 13.7 5" />
    <path d="M14 2.8V5.5h-2.7" />
  </Icon>
);
/** Projects: a drawing folder with a tab. */
export const FolderIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M3 6V15.5h14V7.5H9.8L8.3 5.5H3.5z" />
  </Icon>
);
/** Diagrams: two terminals joined through a node. */
export const DiagramIcon = (p: IconProps) => (
  <Icon {...p}>
    <rect x="2.5" y="3.5" width="5" height="4" rx="1" />
    <rect x="12.5" y="12.5" width="5" height="4" rx="1" />
    <path d="M7.5 5.5H10v9h2.5" />
    <circle cx="10" cy="10" r="1" fill="currentColor" stroke="none" />
  </Icon>
);
export const UsersIcon = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="7.5" cy="7" r="2.6" />
    <path d="M2.8 16c.4-2.7 2.3-4.3 4.7-4.3s4.3 1.6 4.7 4.3" />
    <path d="M12.8 4.6a2.5 2.5 0 0 1 0 4.8M14.3 11.9c1.5.5 2.6 1.8 2.9 4.1" />
  </Icon>
);
export const UserIcon = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="10" cy="7" r="3" />
    <path d="M4.5 16.5c.5-3 2.7-4.8 5.5-4.8s5 1.8 5.5 4.8" />
  </Icon>
);
export const InboxIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M3 11l2-6.5h10L17 11v4.5H3z" />
    <path d="M3 11h4l1 2h4l1-2h4" />
  </Icon>
);
export const MailIcon = (p: IconProps) => (
  <Icon {...p}>
    <rect x="2.75" y="4.75" width="14.5" height="10.5" rx="1.5" />
    <path d="M3.5 5.5L10 10.5l6.5-5" />
  </Icon>
);
export const SignOutIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M8 4H4.5v12H8" />
    <path d="M11.5 6.5L15 10l-3.5 3.5M15 10H7.5" />
  </Icon>
);
export const KeyIcon = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="6.5" cy="10" r="3" />
    <path d="M9.5 10h7.5M14.5 10v2.5M17 10v2" />
  </Icon>
);
export const MonitorIcon = (p: IconProps) => (
  <Icon {...p}>
    <rect x="2.75" y="3.75" width="14.5" height="9.5" rx="1.2" />
    <path d="M7 16.5h6M10 13.5v3" />
  </Icon>
);
export const SwitchIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M4 7h11l-3-3M16 13H5l3 3" />
  </Icon>
);

/* Signal icons: each signal has its own shape, so meaning never rests on colour alone. */

/** Error: a square on its corner with a bar and dot. */
export const ErrorIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M10 2.5L17.5 10 10 17.5 2.5 10z" />
    <path d="M10 6.5v4.2" />
    <circle cx="10" cy="13.3" r=".6" fill="currentColor" />
  </Icon>
);
/** Warning: a triangle with a bar and dot. */
export const WarningIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M10 3l7.5 13.5h-15z" />
    <path d="M10 8v4" />
    <circle cx="10" cy="14.3" r=".6" fill="currentColor" />
  </Icon>
);
/** Note: a circle with an i. */
export const NoteIcon = (p: IconProps) => (
  <Icon {...p}>
    <circle cx="10" cy="10" r="7.25" />
    <path d="M10 9v4.8" />
    <circle cx="10" cy="6.4" r=".6" fill="currentColor" />
  </Icon>
);
/** Safety caution: a fault arc between two terminals. */
export const FaultIcon = (p: IconProps) => (
  <Icon {...p}>
    <path d="M2.5 10h3M14.5 10h3" />
    <path d="M5.5 10l2-3.5 1.8 6 1.9-6 1.8 6 1.5-2.5" />
  </Icon>
);
