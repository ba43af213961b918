import { Link, type LinkProps } from 'react-router-dom';
import { buttonClass, type Size, type Variant } from './button';

/** A router link that looks like a button. Apart from button.tsx so pages built without the router can use Button. */
export function ButtonLink({
  variant = 'primary',
  size = 'md',
  className = '',
  ...rest
}: LinkProps & { variant?: Variant; size?: Size }) {
  return <Link className={buttonClass(variant, size, className)} {...rest} />;
}
