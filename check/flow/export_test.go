package flow

import "circa/check/fluid"

func lookupForTest(name string) (fluid.Fluid, error) { return fluid.Lookup(name) }
