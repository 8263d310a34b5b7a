"""The LibreOffice Calc extension: the catalogue's FS_ functions in Calc.

Everything in the extension is generated from the catalogue
(:func:`fuelsys.sheet.catalogue.functions`) when it is built:

- an IDL interface with one method per function (camelCase names, since the
  IDL compiler refuses underscores; every argument and every result ``any``),
  compiled to a type library with the SDK's ``unoidl-write``;
- ``CalcAddIns.xcu``: each function's spreadsheet name (``FS_...``) as its
  display name and as its en-US compatibility name, so that .xlsx files keep
  the plain names on load and save (LibreOffice 25.2 or later), with the
  function's description and each argument's meaning and unit;
- ``description.xml``, ``META-INF/manifest.xml`` and a passive component
  registration (``fuelsys.components``);
- the Python component (:mod:`fuelsys.sheet.calc_addin.component`, shipped as
  ``fuelsys_calc.py``) and ``fuelsys_build.json``, which records the Python
  environment the extension was built from so that LibreOffice's own Python
  can import fuelsys and its dependencies from there.

Modules: :mod:`.generate` (the files and the .oxt), :mod:`.convert` (UNO values
to cell values and back, used inside LibreOffice), :mod:`.runner` (headless
LibreOffice: install, recalculate, store) and :mod:`.commands` (the
``fuelsys libreoffice`` command).  This package imports nothing heavy.
"""

#: implementation name of the add-in component (also the AddInInfo node)
IMPLEMENTATION_NAME = "org.fuelsys.calc.Functions"
#: the IDL interface the component implements
INTERFACE_NAME = "org.fuelsys.calc.XFuelsysFunctions"
#: the extension's identifier in description.xml
EXTENSION_ID = "org.fuelsys.calc"
#: environment variable with extra Python paths for the component (os.pathsep-separated)
PYTHONPATH_ENV = "FUELSYS_PYTHONPATH"
#: environment variable naming the component's log file
LOG_ENV = "FUELSYS_ADDIN_LOG"
