import { SEARCH_MAX_CHARS } from "@/lib/search/schemas";
import { buttonClasses } from "./button-classes";
import { cx } from "./cx";
import { controlClasses } from "./field";

// The search box: a plain GET form to /search with a real submit button, so it works with the
// keyboard and without JavaScript. The header shows it compact; the search page shows it with its
// error. The length limit is the server's (lib/search/schemas.ts), which checks again.

type SearchFormProps = {
  defaultValue?: string;
  error?: string;
  variant: "header" | "page";
  /** The input's id; the header and the phone menu each have a box, so each names its own. */
  id?: string;
  className?: string;
};

export function SearchForm({
  defaultValue = "",
  error,
  variant,
  id = `${variant}-search`,
  className,
}: SearchFormProps) {
  const header = variant === "header";
  return (
    <form role="search" action="/search" method="get" className={cx("flex items-start gap-2", className)}>
      <div className="flex min-w-0 flex-1 flex-col">
        <label htmlFor={id} className={header ? "sr-only" : "text-sm font-medium text-stone-800"}>
          Search permits, applications, apparatus and people
        </label>
        <input
          id={id}
          name="q"
          type="search"
          defaultValue={defaultValue}
          maxLength={SEARCH_MAX_CHARS}
          placeholder={header ? "Search" : "Permit number, title, room or name"}
          autoComplete="off"
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? `${id}-error` : undefined}
          className={cx(controlClasses, header ? "h-8 w-36 py-1 text-sm lg:w-48" : "mt-1")}
        />
        {error && (
          <p id={`${id}-error`} className="mt-1 text-sm text-red-800" role="alert">
            {error}
          </p>
        )}
      </div>
      <button
        type="submit"
        className={cx(
          buttonClasses({ variant: "secondary", size: header ? "sm" : undefined }),
          header ? "h-8" : "mt-6",
        )}
      >
        Search
      </button>
    </form>
  );
}
