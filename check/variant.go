package check

import "circa/lang"

// The parameters a run sets in place of the file's values (lang.Model.With)
// are noted where the file writes them, so whoever reads the findings knows
// they belong to a variant and not to the file as written.
func init() {
	Register(&Rule{
		ID: "param-set", Category: CategoryLanguage, Severity: lang.Hint, Scope: PerModel, Partial: true,
		Summary:   "a parameter given another value for this run",
		Rationale: "The findings and margins of the run are those of a variant of the design, not of the file as written.",
		Example:   "circa check --set riser_bore=10mm cabinet.loop",
		Fix:       "Nothing to fix: write the value into the file to keep it.",
		Run: func(c *Context) {
			for _, o := range c.Model.Overrides {
				if o.Param == nil {
					continue
				}
				c.Reportf(o.Param.Value.Loc(), "%s is %s in this run in place of the file's %s", o.Name, o.Written(), o.FileText)
			}
		},
	})
}
