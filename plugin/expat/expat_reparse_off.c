/* SPDX-License-Identifier: BSD-3-Clause
 *
 * Preload library: turns expat's reparse deferral off for every parser.
 *
 * Debian 12's security update of expat (2.5.0-1+deb12u5) defers reparsing of
 * large tokens. VTK 9.2's XML reader feeds the parser in pieces and stops at
 * the appended-data marker, which deferral moves: files written in appended
 * mode (the default of ParaView's writers) then read back with zero cells and
 * a "junk after document element" error. Turning deferral off per parser
 * restores the previous behaviour. Use:
 *
 *   LD_PRELOAD=<build>/lib/libwallloads_expat_fix.so pvpython script.py
 *   mpirun -x LD_PRELOAD=<build>/lib/libwallloads_expat_fix.so ... pvbatch ...
 *
 * On an expat without the setting it changes nothing.
 */
#define _GNU_SOURCE
#include <dlfcn.h>
#include <expat.h>

typedef XML_Parser (*create_fn)(const XML_Char*);
typedef XML_Parser (*create_ns_fn)(const XML_Char*, XML_Char);
typedef XML_Parser (*create_mm_fn)(
  const XML_Char*, const XML_Memory_Handling_Suite*, const XML_Char*);
typedef XML_Bool (*deferral_fn)(XML_Parser, XML_Bool);

/* The real expat function. Usually the next definition in the global scope;
 * when expat came in with a library opened locally (RTLD_LOCAL) it is not
 * there, so ask libexpat itself (already loaded, or loaded now). */
static void* real_symbol(const char* name)
{
  void* f = dlsym(RTLD_NEXT, name);
  if (!f)
  {
    void* lib = dlopen("libexpat.so.1", RTLD_NOW | RTLD_NOLOAD);
    if (!lib)
    {
      lib = dlopen("libexpat.so.1", RTLD_NOW);
    }
    if (lib)
    {
      f = dlsym(lib, name);
    }
  }
  return f;
}

static XML_Parser no_deferral(XML_Parser parser)
{
  static deferral_fn set = 0;
  static int looked = 0;
  if (!looked)
  {
    set = (deferral_fn)real_symbol("XML_SetReparseDeferralEnabled");
    looked = 1;
  }
  if (parser && set)
  {
    set(parser, XML_FALSE);
  }
  return parser;
}

XML_Parser XML_ParserCreate(const XML_Char* encoding)
{
  static create_fn real = 0;
  if (!real)
  {
    real = (create_fn)real_symbol("XML_ParserCreate");
  }
  return real ? no_deferral(real(encoding)) : 0;
}

XML_Parser XML_ParserCreateNS(const XML_Char* encoding, XML_Char separator)
{
  static create_ns_fn real = 0;
  if (!real)
  {
    real = (create_ns_fn)real_symbol("XML_ParserCreateNS");
  }
  return real ? no_deferral(real(encoding, separator)) : 0;
}

XML_Parser XML_ParserCreate_MM(
  const XML_Char* encoding, const XML_Memory_Handling_Suite* memsuite, const XML_Char* separator)
{
  static create_mm_fn real = 0;
  if (!real)
  {
    real = (create_mm_fn)real_symbol("XML_ParserCreate_MM");
  }
  return real ? no_deferral(real(encoding, memsuite, separator)) : 0;
}
